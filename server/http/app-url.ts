import type { Request } from 'express';
import { ctx } from '../context.js';

/** The address used in e-mailed links: APP_URL when set, else the address the request came to. */
export function appUrl(req: Request): string {
  return ctx(req).config.APP_URL ?? `${req.protocol}://${req.get('host')}`;
}
