import type { Router } from 'express';
import { authRouter } from './auth/auth.router.js';
import { usersRouter } from './users/users.router.js';
import { sitesRouter } from './sites/sites.router.js';
import { mailRouter } from './mail/mail.router.js';
import { jobsRouter } from './jobs/jobs.router.js';
import { exportsRouter } from './exports/exports.router.js';

/** Every API area mounted behind the session (health is mounted before it, in app.ts). */
export const areas: { prefix: string; router: Router }[] = [authRouter, usersRouter, sitesRouter, mailRouter, jobsRouter, exportsRouter];
