import type { Request } from 'express';
import type { DataSource } from 'typeorm';
import type { Config } from './config.js';
import type { Mailer } from './mail/mailer.js';

/** What every service needs; built once by main.ts (or a test) and handed to createApp. */
export interface AppContext {
  ds: DataSource;
  /** Read-only connection for analysis and export routes (a streaming replica when configured). */
  readDs: DataSource;
  config: Config;
  mailer: Mailer;
}

export function ctx(req: Request): AppContext {
  return req.app.locals.ctx as AppContext;
}
