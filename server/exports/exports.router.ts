import { createReadStream } from 'node:fs';
import { access } from 'node:fs/promises';
import type { Request } from 'express';
import { IdParamSchema } from '../../shared/sites.js';
import { ExportAuditQuerySchema, ExportDecisionSchema, ExportListQuerySchema, ExportRequestCreateSchema } from '../../shared/exports/schemas.js';
import { AGGREGATE_DIMENSIONS, STUDY_ID_VARIABLE } from '../../shared/exports/variables.js';
import { actor, audit } from '../audit/audit.service.js';
import { ctx } from '../context.js';
import { appUrl } from '../http/app-url.js';
import { AppError, notFound } from '../http/errors.js';
import { area, currentUser, parse } from '../http/route.js';
import { currentCatalog } from './catalog.js';
import { csvLine } from './writers/csv.js';
import { auditLog, createRequest, decide, getRequest, listRequests, loadRequest, riskReport, type RequestContext } from './exports.service.js';
import './generate.js';
import './retention.js';

const a = area('/api/exports');
const REQUESTERS = ['analyst', 'researcher'] as const;
const ANY_EXPORT_ROLE = ['admin', 'analyst', 'researcher'] as const;

const rc = (req: Request): RequestContext => ({ ...ctx(req), appUrl: appUrl(req) });

a.get('/variables', ANY_EXPORT_ROLE, () => ({ items: currentCatalog(), studyId: STUDY_ID_VARIABLE, aggregateDimensions: AGGREGATE_DIMENSIONS }));

a.post('/', REQUESTERS, async (req, res) => {
  const input = parse(ExportRequestCreateSchema, req.body, 'export request');
  const view = await createRequest(rc(req), currentUser(req), input, actor(req));
  res.status(201);
  return view;
});

a.get('/', ANY_EXPORT_ROLE, async (req) => {
  const q = parse(ExportListQuerySchema, req.query, 'query');
  return listRequests(ctx(req).ds, currentUser(req), q.scope, q.status);
});

// Before '/:id' so that 'audit' is not taken for an id.
a.get('/audit', ['admin'], async (req) => auditLog(ctx(req).ds, parse(ExportAuditQuerySchema, req.query, 'query')));

a.get('/audit.csv', ['admin'], async (req, res) => {
  const { ds } = ctx(req);
  const all = await auditLog(ds, { page: 1, pageSize: 100_000 });
  await audit(ds, { ...actor(req), action: 'export-audit-export', entity: 'audit_entries', details: { entries: all.total } });
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="alveolog-export-audit-${new Date().toISOString().slice(0, 10)}.csv"`);
  // Text is neutralised so a spreadsheet runs no formula from a reason typed by a user.
  const n = (s: string | null) => (s && /^[=+\-@\t\r]/.test(s) ? `'${s}` : s ?? '');
  res.write(`\uFEFF${csvLine(['at', 'action', 'actor', 'request', 'reason', 'details'])}`);
  for (const e of all.items) res.write(csvLine([e.at, e.action, n(e.actorEmail), e.requestId ?? '', n(e.reason), e.details ? JSON.stringify(e.details) : '']));
  res.end();
});

a.get('/:id', ANY_EXPORT_ROLE, async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  return getRequest(ctx(req).ds, currentUser(req), id);
});

a.get('/:id/risk', ['admin'], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const { ds, readDs } = ctx(req);
  const { sizes: _sizes, ...report } = await riskReport(readDs, await loadRequest(ds, currentUser(req), id));
  return report;
});

a.post('/:id/decision', ['admin'], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const d = parse(ExportDecisionSchema, req.body, 'decision');
  return decide(rc(req), currentUser(req), id, d, actor(req));
});

/**
 * The file, for its requester only, while it has not expired. Anyone else gets 404 (its existence
 * is not revealed, OWASP ASVS 4.0.3 V4.2.1) and the refused attempt is audited.
 */
a.get('/:id/file', REQUESTERS, async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const user = currentUser(req);
  const { ds } = ctx(req);
  const [row] = await ds.query(`SELECT id, requester_id, status, file_path, file_name, file_bytes, expires_at, format FROM export_requests WHERE id = $1`, [id]);
  if (!row || row.requester_id !== user.id) {
    if (row) await audit(ds, { ...actor(req), action: 'export-download-refused', entity: 'export_request', entityId: id, details: { why: 'not the requester' } });
    throw notFound('the export file');
  }
  if (row.status === 'expired' || (row.expires_at && new Date(row.expires_at) <= new Date())) {
    await audit(ds, { ...actor(req), action: 'export-download-refused', entity: 'export_request', entityId: id, details: { why: 'expired' } });
    throw new AppError(410, 'export_expired', 'this export has expired and its file was deleted', { hint: 'ask for a new export if you still need the data' });
  }
  if (row.status !== 'ready' || !row.file_path) throw new AppError(409, 'export_not_ready', `the export is ${row.status}, not ready to download`, { hint: 'wait for the progress bar to finish' });
  await access(row.file_path).catch(() => { throw notFound('the export file'); });
  await ds.transaction(async (tx) => {
    await tx.query(`INSERT INTO export_downloads (request_id, user_id, ip) VALUES ($1, $2, $3)`, [id, user.id, req.ip ?? null]);
    await audit(tx, { ...actor(req), action: 'export-download', entity: 'export_request', entityId: id, details: { file: row.file_name, bytes: Number(row.file_bytes) } });
  });
  res.setHeader('Content-Type', row.format === 'xlsx' ? 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet' : 'application/zip');
  res.setHeader('Content-Disposition', `attachment; filename="${row.file_name}"`);
  res.setHeader('Content-Length', String(row.file_bytes));
  res.setHeader('Cache-Control', 'no-store');
  await new Promise<void>((resolve, reject) => {
    createReadStream(row.file_path).on('error', reject).pipe(res).on('finish', () => resolve()).on('error', reject);
  });
});

export const exportsRouter = a;
