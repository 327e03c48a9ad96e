/**
 * Bulk imports: upload (checked, hashed, scanned), dry run and commit as background jobs,
 * history, problems, abandon, mapping presets. Plain objects in and out (no req/res).
 */
import fs from 'node:fs';
import path from 'node:path';
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { CommitRequest, DryRunRequest, ImportView, Mapping, Problem, SheetInfo, UploadOptions, Preset } from '../../shared/imports/api.js';
import type { AppContext } from '../context.js';
import { audit } from '../audit/audit.service.js';
import { AppError, notFound } from '../http/errors.js';
import { caseSiteScope } from '../http/scope.js';
import { enqueueJob } from '../jobs/jobs.service.js';
import { checkUpload } from './file-check.js';
import { scanUpload } from './scan.js';
import { checkMapping } from './mapping.js';
import { deleteImportFile, storedFile, uploadDir } from './storage.js';
import { discardStagedPlan } from './staged-plan.js';

type Row = Record<string, any>;
const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);
export const DRY_RUN_JOB = 'import.dry-run';
export const COMMIT_JOB = 'import.commit';

export interface UploadedFile { path: string; originalname: string; size: number }
export interface ActorInfo { user: SessionUser; ip: string | null }

const mayUseSite = (user: SessionUser, siteId: string) => {
  const scope = caseSiteScope(user);
  return !scope || scope.includes(siteId);
};

async function previousCommitted(ds: DataSource, hash: string, selfId: string): Promise<ImportView['previousImport']> {
  const [p] = await ds.query(`SELECT id, committed_at, file_name FROM import_jobs WHERE file_hash = $1 AND status = 'committed' AND id <> $2 ORDER BY committed_at DESC LIMIT 1`, [hash, selfId]);
  return p ? { id: p.id, committedAt: iso(p.committed_at), fileName: p.file_name } : null;
}

async function jobStatus(ds: DataSource, id: string | null): Promise<string | null> {
  if (!id) return null;
  const [j] = await ds.query(`SELECT status FROM jobs WHERE id = $1`, [id]);
  return j?.status ?? null;
}

export async function toView(ds: DataSource, r: Row): Promise<ImportView> {
  let status = r.status as ImportView['status'];
  // A job that failed (or was left by a stopped server) leaves its import retryable.
  if (status === 'validating' || status === 'committing') {
    const js = await jobStatus(ds, status === 'validating' ? r.dry_run_job_id : r.commit_job_id);
    if (js === 'failed' || js === 'cancelled') status = 'failed';
  }
  return {
    id: r.id, siteId: r.site_id, siteCode: r.site_code, fileName: r.file_name, fileHash: r.file_hash, fileSize: Number(r.file_size), fileType: r.file_type,
    decimal: r.decimal, status, sheets: r.sheets as SheetInfo[], mapping: r.mapping as Mapping | null, counts: r.counts, problemCount: r.problem_count,
    policy: r.policy, previousImport: await previousCommitted(ds, r.file_hash, r.id), dryRunJobId: r.dry_run_job_id, commitJobId: r.commit_job_id,
    error: r.error ?? (status === 'failed' ? await jobError(ds, r) : null), createdBy: r.created_by, createdByEmail: r.created_by_email ?? null,
    createdAt: iso(r.created_at)!, validatedAt: iso(r.validated_at), committedAt: iso(r.committed_at), fileDeleted: !r.stored_path,
  };
}

async function jobError(ds: DataSource, r: Row): Promise<string | null> {
  const id = r.status === 'committing' ? r.commit_job_id : r.dry_run_job_id;
  if (!id) return null;
  const [j] = await ds.query(`SELECT error FROM jobs WHERE id = $1`, [id]);
  return j?.error ?? null;
}

const SELECT = `SELECT i.*, s.code AS site_code, u.email AS created_by_email FROM import_jobs i JOIN sites s ON s.id = i.site_id LEFT JOIN users u ON u.id = i.created_by`;

/** The import row, or 404 (unknown, or of a site the user is not assigned to). */
export async function loadImport(ds: DataSource, id: string, user: SessionUser): Promise<Row> {
  const [r] = await ds.query(`${SELECT} WHERE i.id = $1`, [id]);
  if (!r || !mayUseSite(user, r.site_id)) throw notFound('the import');
  return r;
}

export async function getImport(ds: DataSource, id: string, user: SessionUser): Promise<ImportView> {
  return toView(ds, await loadImport(ds, id, user));
}

/** POST /api/imports: checks, hashes and scans the file; the import waits for its mapping. */
export async function createImport(context: AppContext, file: UploadedFile, opts: UploadOptions, actor: ActorInfo): Promise<ImportView> {
  const { ds, config } = context;
  try {
    if (!mayUseSite(actor.user, opts.siteId)) {
      throw new AppError(403, 'not_your_site', 'you can only import cases for the sites you are assigned to', { hint: 'choose one of your sites, or ask an administrator to assign you', fields: [{ path: 'siteId', message: 'choose one of your sites' }] });
    }
    const [site] = await ds.query(`SELECT id FROM sites WHERE id = $1 AND active`, [opts.siteId]);
    if (!site) throw new AppError(400, 'validation_failed', 'the site is not an active site', { fields: [{ path: 'siteId', message: 'choose an active site' }], hint: 'choose one of your sites' });
    const facts = await checkUpload(file.path, file.originalname);
    const scan = await scanUpload(file.path, facts.type, opts.kind, file.originalname, config.IMPORT_MAX_ROWS);
    const [row] = await ds.query(
      `INSERT INTO import_jobs (site_id, created_by, file_name, file_hash, file_size, file_type, decimal, default_kind, sheets, stored_path) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, NULL) RETURNING id`,
      [opts.siteId, actor.user.id, path.basename(file.originalname).slice(0, 200), facts.sha256, facts.size, facts.type, opts.decimal, opts.kind, JSON.stringify(scan.sheets)],
    );
    const stored = `${row.id}.${facts.type}`;
    await fs.promises.rename(file.path, path.join(uploadDir(config), stored));
    await ds.query(`UPDATE import_jobs SET stored_path = $2 WHERE id = $1`, [row.id, stored]);
    await audit(ds, { action: 'import-uploaded', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'import', entityId: row.id, details: { fileHash: facts.sha256, fileSize: facts.size, fileType: facts.type, rows: scan.totalRows, siteId: opts.siteId } });
    return getImport(ds, row.id, actor.user);
  } finally {
    await fs.promises.rm(file.path, { force: true });
  }
}

function assertOpen(r: Row, action: string): void {
  if (r.status === 'committed') throw new AppError(409, 'already_committed', `this import was committed on ${iso(r.committed_at)?.slice(0, 10)}; it cannot ${action}`, { hint: 'upload the file again to start a new import' });
  if (r.status === 'abandoned') throw new AppError(409, 'abandoned', `this import was abandoned and its file deleted; it cannot ${action}`, { hint: 'upload the file again' });
}

async function assertNotBusy(ds: DataSource, r: Row): Promise<void> {
  const busyId = r.status === 'validating' ? r.dry_run_job_id : r.status === 'committing' ? r.commit_job_id : null;
  const js = await jobStatus(ds, busyId);
  if (js === 'queued' || js === 'running') throw new AppError(409, 'import_busy', `this import's ${r.status === 'validating' ? 'dry run' : 'commit'} is still running`, { hint: 'wait for it to finish (the progress bar shows how far it is)' });
}

/** POST /api/imports/:id/dry-run: checks the mapping, optionally saves it as a preset, queues the job. */
export async function startDryRun(context: AppContext, id: string, body: DryRunRequest, actor: ActorInfo): Promise<ImportView> {
  const { ds, config } = context;
  const r = await loadImport(ds, id, actor.user);
  assertOpen(r, 'be checked again');
  await assertNotBusy(ds, r);
  if (!storedFile(config, r.stored_path)) throw new AppError(410, 'file_gone', 'the uploaded file is no longer kept (it is deleted after the retention time)', { hint: 'upload the file again' });
  checkMapping(r.sheets as SheetInfo[], body.mapping);
  if (body.savePresetAs) await savePreset(ds, r.site_id, body.savePresetAs, body.mapping, actor.user);
  await discardStagedPlan(config, id);
  const jobId = await enqueueJob(ds, DRY_RUN_JOB, { importId: id }, actor.user.id);
  await ds.query(`UPDATE import_jobs SET mapping = $2, status = 'validating', dry_run_job_id = $3, error = NULL, counts = NULL, problems = '[]', problem_count = 0 WHERE id = $1`, [id, JSON.stringify(body.mapping), jobId]);
  return getImport(ds, id, actor.user);
}

/** POST /api/imports/:id/commit: after a clean dry run; a file imported before needs confirmation. */
export async function startCommit(context: AppContext, id: string, body: CommitRequest, actor: ActorInfo): Promise<ImportView> {
  const { ds } = context;
  const r = await loadImport(ds, id, actor.user);
  assertOpen(r, 'be committed again');
  await assertNotBusy(ds, r);
  if (r.status !== 'validated' || !r.counts) throw new AppError(409, 'dry_run_needed', 'run the dry run first and read its result', { hint: 'map the columns and start the dry run' });
  if (r.counts.rejected > 0) {
    throw new AppError(400, 'rows_rejected', `${r.counts.rejected} row${r.counts.rejected === 1 ? ' was' : 's were'} rejected by the dry run; an import writes all rows or none`, { hint: 'download the problems, fix the file, upload it again and run the dry run' });
  }
  const prev = await previousCommitted(ds, r.file_hash, r.id);
  if (prev && !body.confirmReupload) {
    throw new AppError(409, 'already_imported', `this file was already imported on ${prev.committedAt?.slice(0, 10)} ("${prev.fileName}")`, { hint: 'if you really mean to import it again, confirm the re-upload', details: { previousImport: prev } });
  }
  const jobId = await enqueueJob(ds, COMMIT_JOB, { importId: id, policy: body.existing, confirmReupload: !!body.confirmReupload }, actor.user.id);
  await ds.query(`UPDATE import_jobs SET status = 'committing', policy = $2, commit_job_id = $3, error = NULL WHERE id = $1`, [id, body.existing, jobId]);
  return getImport(ds, id, actor.user);
}

export async function abandonImport(context: AppContext, id: string, actor: ActorInfo): Promise<ImportView> {
  const { ds, config } = context;
  const r = await loadImport(ds, id, actor.user);
  assertOpen(r, 'be abandoned');
  await assertNotBusy(ds, r);
  await ds.query(`UPDATE import_jobs SET status = 'abandoned', abandoned_at = now() WHERE id = $1`, [id]);
  await deleteImportFile(ds, config, id);
  await audit(ds, { action: 'import-abandoned', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'import', entityId: id });
  return getImport(ds, id, actor.user);
}

export async function listImports(ds: DataSource, user: SessionUser, page: number, pageSize: number): Promise<{ items: ImportView[]; total: number; page: number; pageSize: number }> {
  const scope = caseSiteScope(user);
  const where = scope ? `WHERE i.site_id = ANY($1)` : `WHERE $1::uuid[] IS NULL`;
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM import_jobs i ${where}`, [scope]);
  const rows = await ds.query(`${SELECT} ${where} ORDER BY i.created_at DESC LIMIT $2 OFFSET $3`, [scope, pageSize, (page - 1) * pageSize]);
  const items: ImportView[] = [];
  for (const r of rows) items.push(await toView(ds, r));
  return { items, total: n, page, pageSize };
}

export async function importProblems(ds: DataSource, id: string, user: SessionUser, q: { page: number; pageSize: number; severity?: 'error' | 'warning' }) {
  const r = await loadImport(ds, id, user);
  const all = (r.problems as Problem[]).filter((p) => !q.severity || p.severity === q.severity);
  return { items: all.slice((q.page - 1) * q.pageSize, q.page * q.pageSize), total: all.length, stored: (r.problems as Problem[]).length, problemCount: r.problem_count as number, page: q.page, pageSize: q.pageSize };
}

// --- Mapping presets (per site) --------------------------------------------------------------

const toPreset = (r: Row): Preset => ({ id: r.id, siteId: r.site_id, name: r.name, mapping: r.mapping, updatedAt: iso(r.updated_at)! });

export async function listPresets(ds: DataSource, siteId: string, user: SessionUser): Promise<Preset[]> {
  if (!mayUseSite(user, siteId)) throw notFound('the site');
  return (await ds.query(`SELECT * FROM import_mapping_presets WHERE site_id = $1 ORDER BY name`, [siteId])).map(toPreset);
}

export async function savePreset(ds: DataSource, siteId: string, name: string, mapping: Mapping, user: SessionUser): Promise<Preset> {
  if (!mayUseSite(user, siteId)) throw notFound('the site');
  const [r] = await ds.query(
    `INSERT INTO import_mapping_presets (site_id, name, mapping, created_by) VALUES ($1, $2, $3, $4)
     ON CONFLICT (site_id, name) DO UPDATE SET mapping = EXCLUDED.mapping, updated_at = now() RETURNING *`,
    [siteId, name, JSON.stringify(mapping), user.id],
  );
  return toPreset(r);
}

export async function deletePreset(ds: DataSource, id: string, user: SessionUser): Promise<void> {
  const [r] = await ds.query(`SELECT site_id FROM import_mapping_presets WHERE id = $1`, [id]);
  if (!r || !mayUseSite(user, r.site_id)) throw notFound('the preset');
  await ds.query(`DELETE FROM import_mapping_presets WHERE id = $1`, [id]);
}
