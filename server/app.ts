import express from 'express';
import session from 'express-session';
import helmet from 'helmet';
import rateLimit from 'express-rate-limit';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import type { AppContext } from './context.js';
import { configurePassport } from './auth/passport.js';
import { createSessionStore } from './auth/session-store.js';
import { csrfSynchronisedProtection } from './auth/csrf.js';
import { AppError, apiNotFound, errorHandler } from './http/errors.js';
import { healthRouter } from './health/health.router.js';
import { areas } from './routes.js';
import './jobs/housekeeping.js';

/** Builds the Express app without listening (tests start it in-process with supertest). */
export function createApp(context: AppContext, opts: { staticDir?: string } = {}) {
  const { config } = context;
  const app = express();
  app.locals.ctx = context;
  app.disable('x-powered-by');
  // API answers carry health data: never stored by a browser or proxy (OWASP ASVS V8.2.1), so an
  // ETag (a hash of every JSON body) would serve nothing. Static files keep theirs.
  app.set('etag', false);
  if (config.TRUST_PROXY) app.set('trust proxy', 1);
  app.use(helmet({ contentSecurityPolicy: { directives: { 'img-src': ["'self'", 'data:', 'blob:'] } } }));
  app.use(express.json({ limit: '2mb' }));

  app.use('/api', (_req, res, next) => { res.setHeader('Cache-Control', 'no-store'); next(); });
  app.use(healthRouter.prefix, healthRouter.router);

  const sessionPool = new pg.Pool({ connectionString: config.DATABASE_URL, max: 5, connectionTimeoutMillis: 3000 });
  sessionPool.on('error', () => undefined); // reconnects on next use; errors surface per request
  app.locals.sessionPool = sessionPool;
  const idleMs = config.IDLE_MINUTES * 60_000;
  // The session row is rewritten at most once per `refreshMs` (not on every request: a write per
  // GET halved the throughput under load). The idle check allows for that granularity, so a
  // session ends at most `refreshMs` late and never early; the store row and the cookie live as
  // long, and touch() is off because the periodic save already renews the row's expiry. The
  // cookie is sent again with each save (not `rolling` on every response), which keeps its
  // expiry ahead of the idle limit without a signature per request.
  const refreshMs = Math.min(60_000, idleMs / 10);
  app.use(
    '/api',
    session({
      name: 'alveolog.sid',
      store: createSessionStore({ pool: sessionPool, ttlMs: config.SESSION_USER_CACHE_MS, pruneSeconds: 15 * 60 }),
      secret: config.SESSION_SECRET,
      resave: false,
      saveUninitialized: false,
      rolling: false,
      cookie: { httpOnly: true, sameSite: 'strict', secure: config.NODE_ENV === 'production' && !!config.APP_URL?.startsWith('https'), maxAge: idleMs + refreshMs, path: '/' },
    }),
  );
  // Idle time-out for shared ward computers (OWASP ASVS V3.3.2): a session unused for IDLE_MINUTES ends.
  app.use('/api', (req, _res, next) => {
    const s = req.session as unknown as { lastSeen?: number; passport?: unknown } | undefined;
    const now = Date.now();
    if (s?.passport && s.lastSeen && now - s.lastSeen > idleMs + refreshMs) {
      return req.session.destroy(() => next(new AppError(401, 'session_expired', `you were signed out after ${config.IDLE_MINUTES} minutes without activity`, { hint: 'sign in again' })));
    }
    if (s?.passport && (!s.lastSeen || now - s.lastSeen >= refreshMs)) s.lastSeen = now;
    next();
  });
  const passport = configurePassport(context);
  app.locals.passport = passport;
  app.use('/api', passport.initialize());
  app.use('/api', passport.session());
  app.use('/api/auth/login', rateLimit({ windowMs: 15 * 60_000, limit: config.LOGIN_RATE_LIMIT, standardHeaders: 'draft-7', legacyHeaders: false,
    handler: (_req, _res, next) => next(new AppError(429, 'too_many_attempts', 'too many sign-in attempts from this computer', { hint: 'wait 15 minutes and try again' })) }));
  app.use('/api', csrfSynchronisedProtection);

  for (const a of areas) app.use(a.prefix, a.router);
  app.use('/api', apiNotFound);

  const staticDir = opts.staticDir;
  if (staticDir && fs.existsSync(path.join(staticDir, 'index.html'))) {
    app.use(express.static(staticDir, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(staticDir, 'index.html')));
  }
  app.use(errorHandler);
  return app;
}
