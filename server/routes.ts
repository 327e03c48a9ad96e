import type { Router } from 'express';
import { authRouter } from './auth/auth.router.js';
import { usersRouter } from './users/users.router.js';
import { sitesRouter } from './sites/sites.router.js';
import { mailRouter } from './mail/mail.router.js';
import { jobsRouter } from './jobs/jobs.router.js';
import { importsRouter } from './imports/imports.router.js';
import { casesRouter } from './cases/cases.router.js';
import { therapyRouter } from './therapy/therapy.router.js';
import { caseOutcomesRouter, outcomesRouter } from './outcomes/outcomes.router.js';
import { worklistRouter } from './worklist/worklist.router.js';
import { dictionaryRouter } from './dictionary/dictionary.router.js';
import { exportsRouter } from './exports/exports.router.js';
import { analysisRouter } from './analysis/analysis.router.js';
import { cohortsRouter } from './cohorts/cohorts.router.js';
import { measuresRouter } from './measures/measures.router.js';
import { committeeRouter } from './committee/committee.router.js';
import { reviewsRouter } from './reviews/reviews.router.js';
import { qualityRouter } from './quality/quality.router.js';

/** Every API area mounted behind the session (health is mounted before it, in app.ts). */
export const areas: { prefix: string; router: Router }[] = [authRouter, usersRouter, sitesRouter, mailRouter, jobsRouter, importsRouter,
  casesRouter, therapyRouter, caseOutcomesRouter, outcomesRouter, worklistRouter, dictionaryRouter, exportsRouter,
  analysisRouter, cohortsRouter, measuresRouter, committeeRouter, reviewsRouter, qualityRouter];
