import type { Request } from 'express';
import { currentUser } from '../http/route.js';
import type { Who } from './months.service.js';

/** The signed-in user as the services record them in the audit trail. */
export function who(req: Request): Who {
  const u = currentUser(req);
  return { id: u.id, email: u.email, ip: req.ip ?? null };
}
