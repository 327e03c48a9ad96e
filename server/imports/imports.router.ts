/**
 * /api/imports: template download, upload (multer, UPLOAD_MAX_MB), dry run and commit jobs,
 * history, problems (JSON and xlsx), abandon, mapping presets. Abstractors and admins only.
 */
import { randomUUID } from 'node:crypto';
import type { Request, Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { AppError } from '../http/errors.js';
import { IdParamSchema } from '../../shared/sites.js';
import { CommitRequestSchema, DryRunRequestSchema, ImportListQuerySchema, MappingSchema, PresetListQuerySchema, ProblemsQuerySchema, UploadOptionsSchema } from '../../shared/imports/api.js';
import { audit } from '../audit/audit.service.js';
import { abandonImport, createImport, deletePreset, getImport, importProblems, listImports, listPresets, loadImport, savePreset, startCommit, startDryRun } from './imports.service.js';
import { buildTemplate } from './template.js';
import { problemsWorkbook } from './problems-xlsx.js';
import { uploadDir } from './storage.js';
import './imports.jobs.js';

const WRITERS = ['admin', 'abstractor'] as const;
const XLSX = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
const a = area('/api/imports');

const actorOf = (req: Request) => ({ user: currentUser(req), ip: req.ip ?? null });

function receiveFile(req: Request, res: Response): Promise<void> {
  const { config } = ctx(req);
  const upload = multer({
    storage: multer.diskStorage({ destination: uploadDir(config), filename: (_req, _file, cb) => cb(null, `upload-${randomUUID()}`) }),
    limits: { fileSize: Math.floor(config.UPLOAD_MAX_MB * 1024 * 1024), files: 1, fields: 10, fieldSize: 1000 },
  }).single('file');
  return new Promise((resolve, reject) => upload(req, res, (err: unknown) => {
    if (!err) return resolve();
    const e = err as { code?: string; message?: string };
    if (e.code === 'LIMIT_FILE_SIZE') {
      return reject(new AppError(413, 'file_too_large', `the file is larger than the upload limit of ${config.UPLOAD_MAX_MB} MB`, { hint: 'split the file into smaller ones, or ask an administrator to raise UPLOAD_MAX_MB' }));
    }
    reject(new AppError(400, 'upload_failed', `the upload could not be read (${e.message ?? e.code})`, { hint: 'send one file in the form field "file" with the fields siteId, decimal and kind' }));
  }));
}

a.get('/template', [...WRITERS], async (_req, res) => {
  const buf = await buildTemplate();
  res.setHeader('Content-Type', XLSX);
  res.setHeader('Content-Disposition', 'attachment; filename="alveolog-import-template.xlsx"');
  res.end(buf);
});

a.get('/presets', [...WRITERS], async (req) => {
  const q = parse(PresetListQuerySchema, req.query, 'query');
  return listPresets(ctx(req).ds, q.siteId, currentUser(req));
});

a.post('/presets', [...WRITERS], async (req, res) => {
  const body = parse(z.strictObject({ siteId: z.uuid('choose the site'), name: z.string().trim().min(1, 'name the preset').max(60), mapping: MappingSchema }), req.body, 'preset');
  const p = await savePreset(ctx(req).ds, body.siteId, body.name, body.mapping, currentUser(req));
  res.status(201);
  return p;
});

a.delete('/presets/:id', [...WRITERS], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  await deletePreset(ctx(req).ds, id, currentUser(req));
});

a.get('/', [...WRITERS], async (req) => {
  const q = parse(ImportListQuerySchema, req.query, 'query');
  return listImports(ctx(req).ds, currentUser(req), q.page, q.pageSize);
});

a.post('/', [...WRITERS], async (req, res) => {
  await receiveFile(req, res);
  const file = req.file;
  try {
    if (!file) throw new AppError(400, 'no_file', 'no file was sent', { hint: 'choose a .csv or .xlsx file and upload it in the form field "file"' });
    const opts = parse(UploadOptionsSchema, { ...req.body }, 'upload form');
    const view = await createImport(ctx(req), { path: file.path, originalname: file.originalname, size: file.size }, opts, actorOf(req));
    res.status(201);
    return view;
  } finally {
    if (file) await import('node:fs').then((fs) => fs.promises.rm(file.path, { force: true }));
  }
});

a.get('/:id', [...WRITERS], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  return getImport(ctx(req).ds, id, currentUser(req));
});

a.post('/:id/dry-run', [...WRITERS], async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const body = parse(DryRunRequestSchema, req.body, 'mapping');
  res.status(202);
  return startDryRun(ctx(req), id, body, actorOf(req));
});

a.post('/:id/commit', [...WRITERS], async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const body = parse(CommitRequestSchema, req.body, 'commit');
  res.status(202);
  return startCommit(ctx(req), id, body, actorOf(req));
});

a.post('/:id/abandon', [...WRITERS], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  return abandonImport(ctx(req), id, actorOf(req));
});

a.get('/:id/problems', [...WRITERS], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const q = parse(ProblemsQuerySchema, req.query, 'query');
  return importProblems(ctx(req).ds, id, currentUser(req), q);
});

a.get('/:id/problems.xlsx', [...WRITERS], async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const r = await loadImport(ctx(req).ds, id, currentUser(req));
  const buf = await problemsWorkbook(r.file_name, r.sheets, r.problems, r.problem_count);
  await audit(ctx(req).ds, { action: 'download', ...{ actorId: currentUser(req).id, actorEmail: currentUser(req).email, ip: req.ip ?? null }, entity: 'import', entityId: id, details: { what: 'import problems' } });
  res.setHeader('Content-Type', XLSX);
  res.setHeader('Content-Disposition', `attachment; filename="import-problems-${id.slice(0, 8)}.xlsx"`);
  res.end(buf);
});

export const importsRouter = a;
