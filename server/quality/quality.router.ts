/**
 * /api/quality: completeness, case capture (theatre lists), re-abstraction agreement and the
 * definition-consistency findings. Roles (DESIGN.md role table): case-level quality views for
 * those who read cases of their sites; uploads by those who enter cases; samples are drawn by
 * admins and analysts; blind entry by the assigned abstractor; adjudication (a case change) by
 * admins and abstractors who did not abstract the case.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Request, Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { IdParamSchema } from '../../shared/sites.js';
import { CompletenessQuerySchema } from '../../shared/quality/completeness.js';
import { CaptureQuerySchema, TheatreListUploadFieldsSchema } from '../../shared/quality/capture.js';
import { AdjudicationSchema, ReabstractionEntrySchema, SampleDrawSchema } from '../../shared/quality/reabstraction.js';
import { CheckRunSchema, FindingListQuerySchema, FindingReviewSchema } from '../../shared/quality/findings.js';
import { SiteListSchema } from '../../shared/quality/common.js';
import { ctx } from '../context.js';
import { AppError } from '../http/errors.js';
import { area, currentUser, parse } from '../http/route.js';
import type { Actor } from '../registry/case-write.js';
import { audit } from '../audit/audit.service.js';
import { completenessReport } from './completeness.service.js';
import { captureReport, saveTheatreList } from './capture.service.js';
import { readTheatreList } from './theatre-list.reader.js';
import { adjudicate, agreementReport, blindWork, candidateAbstractors, drawSample, samplesFor, submitEntry } from './reabstraction.service.js';
import { agreementWorkbook } from './report.xlsx.js';
import { listFindings, reviewFinding, startCheck } from './findings.service.js';
import './findings.job.js';

const a = area('/api/quality');
const READERS = ['admin', 'abstractor', 'analyst', 'committee'] as const;
const WRITERS = ['admin', 'abstractor'] as const;
const SAMPLERS = ['admin', 'analyst'] as const;
const QUALITY_STAFF = ['admin', 'abstractor', 'analyst'] as const;

const actorOf = (req: Request): Actor => ({ user: currentUser(req), ip: req.ip ?? null });
const idOf = (req: Request) => parse(IdParamSchema, { id: req.params.id }, 'address').id;

a.get('/completeness', READERS, async (req) => completenessReport(ctx(req).readDs, ctx(req).config, currentUser(req), parse(CompletenessQuerySchema, req.query, 'data-quality filter')));

// --- Case capture -----------------------------------------------------------------------------
a.get('/capture', READERS, async (req) => captureReport(ctx(req).readDs, currentUser(req), parse(CaptureQuerySchema, req.query, 'capture filter')));

function uploadOne(req: Request, res: Response): Promise<Express.Multer.File> {
  const { config } = ctx(req);
  const dir = path.join(config.DATA_DIR, 'quality-uploads');
  fs.mkdirSync(dir, { recursive: true });
  const up = multer({ dest: dir || os.tmpdir(), limits: { fileSize: config.UPLOAD_MAX_MB * 1024 * 1024, files: 1, fields: 5 } }).single('file');
  return new Promise((resolve, reject) => {
    up(req, res, (err: unknown) => {
      if (err) {
        const e = err as { code?: string };
        if (e.code === 'LIMIT_FILE_SIZE') return reject(new AppError(413, 'file_too_large', `the file is larger than ${config.UPLOAD_MAX_MB} MB`, { hint: 'upload the list in parts (e.g. one month per file)' }));
        return reject(new AppError(400, 'upload_failed', 'the upload could not be read', { hint: 'send the list as a multipart form with the file in the field "file" and the site in "siteId"' }));
      }
      if (!req.file) return reject(new AppError(400, 'no_file', 'no file was uploaded', { hint: 'choose the theatre list (.csv or .xlsx) and upload it', fields: [{ path: 'file', message: 'choose a file' }] }));
      resolve(req.file);
    });
  });
}

a.post('/capture/theatre-lists', WRITERS, async (req, res) => {
  const file = await uploadOne(req, res);
  try {
    const { siteId } = parse(TheatreListUploadFieldsSchema, { siteId: req.body?.siteId }, 'theatre-list upload');
    const { config, ds } = ctx(req);
    const list = await readTheatreList(file.path, file.originalname, { siteId, secret: config.IDENTIFIER_HASH_SECRET, maxRows: config.IMPORT_MAX_ROWS });
    const out = await saveTheatreList(ds, siteId, list, actorOf(req));
    res.status(201);
    return out;
  } finally {
    await fs.promises.rm(file.path, { force: true });
  }
});

// --- Re-abstraction ---------------------------------------------------------------------------
a.get('/reabstraction/abstractors', SAMPLERS, async (req) => {
  const { siteId } = parse(z.strictObject({ siteId: SiteListSchema }), req.query, 'abstractor filter');
  return candidateAbstractors(ctx(req).ds, currentUser(req), siteId);
});
a.get('/reabstraction/samples', QUALITY_STAFF, async (req) => samplesFor(ctx(req).ds, currentUser(req)));
a.post('/reabstraction/samples', SAMPLERS, async (req, res) => {
  const out = await drawSample(ctx(req).ds, parse(SampleDrawSchema, req.body, 'sample'), actorOf(req));
  res.status(201);
  return out;
});
a.get('/reabstraction/samples/:id/blind', WRITERS, async (req) => blindWork(ctx(req).ds, idOf(req), currentUser(req)));
a.post('/reabstraction/items/:id', WRITERS, async (req) => submitEntry(ctx(req).ds, idOf(req), parse(ReabstractionEntrySchema, req.body, 're-abstraction').values, actorOf(req)));
a.get('/reabstraction/samples/:id/report', QUALITY_STAFF, async (req) => agreementReport(ctx(req).ds, idOf(req), currentUser(req)));
a.get('/reabstraction/samples/:id/report.xlsx', QUALITY_STAFF, async (req, res) => {
  const report = await agreementReport(ctx(req).ds, idOf(req), currentUser(req));
  const buf = await agreementWorkbook(report);
  const actor = actorOf(req);
  await audit(ctx(req).ds, { action: 'export', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'reabstraction-sample', entityId: report.sample.id, details: { what: 'agreement report (xlsx)' } });
  res.setHeader('Content-Type', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
  res.setHeader('Content-Disposition', `attachment; filename="agreement-${report.sample.id.slice(0, 8)}.xlsx"`);
  res.send(buf);
});
a.post('/reabstraction/items/:id/adjudications', WRITERS, async (req, res) => {
  const out = await adjudicate({ ds: ctx(req).ds, config: ctx(req).config }, idOf(req), parse(AdjudicationSchema, req.body, 'adjudication'), actorOf(req));
  res.status(201);
  return out;
});

// --- Definition consistency -------------------------------------------------------------------
a.post('/checks', SAMPLERS, async (req, res) => {
  const out = await startCheck(ctx(req).ds, currentUser(req), parse(CheckRunSchema, req.body ?? {}, 'consistency check').siteIds);
  res.status(202);
  return out;
});
a.get('/findings', QUALITY_STAFF, async (req) => listFindings(ctx(req).readDs, currentUser(req), parse(FindingListQuerySchema, req.query, 'findings filter')));
a.post('/findings/:id/review', QUALITY_STAFF, async (req) => reviewFinding(ctx(req).ds, idOf(req), parse(FindingReviewSchema, req.body, 'review').reason, actorOf(req)));

export const qualityRouter = a;
