import express, { type Request, type Response, type NextFunction, type Router } from 'express';
import type { z } from 'zod';
import type { Access, Role } from '../../shared/auth/roles.js';
import type { SessionUser } from '../../shared/auth/user.js';
import { AppError, fromZod, forbidden } from './errors.js';

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export interface RouteDef { method: Method; path: string; access: Access }

/** Every API route, as declared: the role guard reads it and the security tests enumerate it. */
export const routeTable: RouteDef[] = [];

type Handler = (req: Request, res: Response) => unknown | Promise<unknown>;

export function currentUser(req: Request): SessionUser {
  const user = req.user as SessionUser | undefined;
  if (!user) throw new AppError(401, 'not_signed_in', 'sign in to continue', { hint: 'your session may have ended; sign in again' });
  return user;
}

export function hasRole(user: SessionUser, roles: readonly Role[]): boolean {
  return user.roles.some((r) => roles.includes(r));
}

/** Decides whether a user passes a route's declared access. */
export function allows(access: Access, user: SessionUser | undefined): 'ok' | 401 | 403 {
  if (access === 'public') return 'ok';
  if (!user) return 401;
  if (access === 'signed-in') return 'ok';
  if (Array.isArray(access)) return hasRole(user, access as readonly Role[]) ? 'ok' : 403;
  const spec = access as { roles: readonly Role[]; chair?: boolean };
  // `chair: true` means: admins, or committee members flagged as chair.
  if (spec.chair) return user.roles.includes('admin') || (user.roles.includes('committee') && user.isChair) ? 'ok' : 403;
  return hasRole(user, spec.roles) ? 'ok' : 403;
}

function guard(access: Access, fullPath: string) {
  return (req: Request, _res: Response, next: NextFunction) => {
    const user = req.user as SessionUser | undefined;
    const verdict = allows(access, user);
    if (verdict === 401) return next(new AppError(401, 'not_signed_in', 'sign in to continue', { hint: 'your session may have ended; sign in again' }));
    if (verdict === 403) return next(forbidden());
    if (user?.mustEnrollTotp && !fullPath.startsWith('/api/auth/')) {
      return next(new AppError(403, 'totp_enrollment_required', 'administrators must set up a second factor before continuing', { hint: 'open Account > Two-step sign-in and scan the code with an authenticator app' }));
    }
    next();
  };
}

function wrap(handler: Handler) {
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const out = await handler(req, res);
      if (!res.headersSent && out !== undefined) res.json(out);
      else if (!res.headersSent && !res.writableEnded) res.status(204).end();
    } catch (err) {
      next(err);
    }
  };
}

/** A router for one area (`/api/cases`, ...) whose routes each declare who may call them. */
export function area(prefix: string) {
  const router: Router = express.Router();
  const add = (method: Method) => (path: string, access: Access, handler: Handler) => {
    const full = (prefix + (path === '/' ? '' : path)) || '/';
    routeTable.push({ method, path: full, access });
    (router as unknown as Record<string, (p: string, ...h: unknown[]) => void>)[method.toLowerCase()](path, guard(access, full), wrap(handler));
  };
  return { prefix, router, get: add('GET'), post: add('POST'), put: add('PUT'), patch: add('PATCH'), delete: add('DELETE') };
}

/** Parses input with a shared zod schema; a failure is a 400 naming every field. */
export function parse<S extends z.ZodType>(schema: S, input: unknown, where: string): z.infer<S> {
  const r = schema.safeParse(input);
  if (!r.success) throw fromZod(r.error, where);
  return r.data;
}
