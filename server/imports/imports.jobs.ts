/**
 * The import's background jobs. Dry run: build the plan, store counts and problems, and keep a
 * clean plan for the commit (staged-plan.ts). Commit: take that plan while the registry facts it
 * was built on still hold, else build it again from the file; refuse if any row is rejected, then
 * write everything in ONE transaction; the uploaded file and the plan are deleted afterwards.
 */
import type { AppContext } from '../context.js';
import { JobCancelled, registerJobKind, registerSchedule, type JobTools } from '../jobs/registry.js';
import { audit } from '../audit/audit.service.js';
import { AppError } from '../http/errors.js';
import { todayIn } from '../../shared/registry/derived.js';
import type { ExistingPolicy, Mapping, SheetInfo } from '../../shared/imports/api.js';
import type { RecordKind } from '../../shared/imports/fields.js';
import { therapyCheckSettings } from '../registry/settings.js';
import type { TherapyCheckSettings } from '../../shared/clinical/modalities.js';
import { buildPlan, type Plan, type PlanUser } from './plan.js';
import { writePlan } from './writer.js';
import { deleteImportFile, purgeExpiredUploads, storedFile } from './storage.js';
import { loadStagedPlan, planBasis, saveStagedPlan, type ImportRow } from './staged-plan.js';
import { logger } from '../logger.js';
import { COMMIT_JOB, DRY_RUN_JOB } from './imports.service.js';

/** Problems kept per import (all are counted; the first ones are stored and downloadable). */
export const MAX_STORED_PROBLEMS = 5000;

type Row = Record<string, any>;

async function planUser(context: AppContext, userId: string | null): Promise<PlanUser> {
  const [u] = await context.ds.query(`SELECT id, email, roles, active FROM users WHERE id = $1`, [userId]);
  if (!u || !u.active) throw new AppError(403, 'user_inactive', 'the user who started this import is no longer active', { hint: 'upload the file again as an active user' });
  const sites: { site_id: string }[] = await context.ds.query(`SELECT site_id FROM user_sites WHERE user_id = $1`, [u.id]);
  return { id: u.id, email: u.email, allSites: (u.roles as string[]).includes('admin'), siteIds: sites.map((s) => s.site_id) };
}

async function loadRow(context: AppContext, importId: string): Promise<Row> {
  const [r] = await context.ds.query(`SELECT * FROM import_jobs WHERE id = $1`, [importId]);
  if (!r) throw new Error('the import no longer exists');
  return r;
}

async function plan(context: AppContext, r: Row, user: PlanUser, tools: JobTools, therapySettings: TherapyCheckSettings): Promise<Plan> {
  const filePath = storedFile(context.config, r.stored_path);
  if (!filePath) throw new AppError(410, 'file_gone', 'the uploaded file is no longer kept; upload it again');
  return buildPlan({
    db: context.ds, filePath, fileType: r.file_type, fileName: r.file_name, sheets: r.sheets as SheetInfo[], mapping: r.mapping as Mapping,
    decimal: r.decimal, uploadSiteId: r.site_id, defaultKind: r.default_kind as RecordKind, user, secret: context.config.IDENTIFIER_HASH_SECRET,
    today: todayIn(context.config.NETWORK_TIME_ZONE, new Date()), therapySettings, maxProblems: MAX_STORED_PROBLEMS,
    onProgress: (p) => tools.progress(p),
    checkCancelled: async () => { if (await tools.isCancelled()) throw new JobCancelled(); },
  });
}

registerJobKind(DRY_RUN_JOB, async (job, tools, context) => {
  const importId = String(job.payload.importId);
  const r = await loadRow(context, importId);
  try {
    const user = await planUser(context, job.createdBy);
    const settings = await therapyCheckSettings(context.ds);
    const basis = await planBasis(context.ds, r as ImportRow, user, settings);
    const p = await plan(context, r, user, tools, settings);
    if (p.errorCount === 0) await saveStagedPlan(context.config, importId, basis, p);
    await context.ds.query(`UPDATE import_jobs SET status = 'validated', counts = $2, problems = $3, problem_count = $4, validated_at = now(), error = NULL WHERE id = $1`,
      [importId, JSON.stringify(p.counts), JSON.stringify(p.problems), p.problemCount]);
    return { importId, counts: p.counts, problemCount: p.problemCount };
  } catch (err) {
    if (!(err instanceof JobCancelled)) await context.ds.query(`UPDATE import_jobs SET error = $2 WHERE id = $1`, [importId, errorText(err)]);
    throw err;
  }
});

registerJobKind(COMMIT_JOB, async (job, tools, context) => {
  const importId = String(job.payload.importId);
  const policy = job.payload.policy as ExistingPolicy;
  const r = await loadRow(context, importId);
  if (r.status === 'committed') return { importId, alreadyCommitted: true };
  const user = await planUser(context, job.createdBy);
  const settings = await therapyCheckSettings(context.ds);
  const staged = await loadStagedPlan(context.ds, context.config, r as ImportRow, user, settings);
  let p: Plan;
  if (staged.plan) {
    p = staged.plan;
    await tools.progress({ total: p.counts.rows, parsed: p.counts.rows, validated: p.counts.rows });
  } else {
    logger.info({ importId, reason: staged.reason }, 'import commit checks the file again');
    p = await plan(context, r, user, tools, settings);
  }
  if (p.errorCount > 0) {
    await context.ds.query(`UPDATE import_jobs SET status = 'validated', counts = $2, problems = $3, problem_count = $4, validated_at = now(), error = $5 WHERE id = $1`,
      [importId, JSON.stringify(p.counts), JSON.stringify(p.problems), p.problemCount, 'rows were rejected when the commit checked the file again; nothing was imported']);
    throw new AppError(400, 'rows_rejected', `${p.counts.rejected} row(s) were rejected when the commit checked the file again (the registry changed since the dry run); nothing was imported`);
  }
  const year = Number(todayIn(context.config.NETWORK_TIME_ZONE, new Date()).slice(0, 4));
  const written = await context.ds.transaction(async (tx) => {
    const w = await writePlan(tx, p, { importId, user, policy, year, batchRows: context.config.IMPORT_BATCH_ROWS, progress: (n) => tools.progress({ written: n }) });
    const counts = { ...p.counts, written: w.written, skipped: w.skipped };
    const res = await tx.query(`UPDATE import_jobs SET status = 'committed', committed_at = now(), counts = $2, error = NULL WHERE id = $1 AND status = 'committing' RETURNING id`, [importId, JSON.stringify(counts)]);
    if (!(Array.isArray(res[0]) ? res[0] : res).length) throw new AppError(409, 'import_changed', 'the import was abandoned or committed by someone else meanwhile; nothing was imported');
    await audit(tx, { action: 'import-committed', actorId: user.id, actorEmail: user.email, entity: 'import', entityId: importId,
      details: { fileHash: r.file_hash, policy, casesCreated: w.casesCreated, casesUpdated: w.casesUpdated, therapyAdded: w.therapyAdded, outcomesAdded: w.outcomesAdded, skipped: w.skipped, reupload: !!job.payload.confirmReupload } });
    return { ...w, counts };
  });
  await deleteImportFile(context.ds, context.config, importId);
  return { importId, counts: written.counts, casesCreated: written.casesCreated, casesUpdated: written.casesUpdated, therapyAdded: written.therapyAdded, outcomesAdded: written.outcomesAdded, skipped: written.skipped };
});

registerSchedule({ name: 'import-upload-retention', everyMs: 15 * 60_000, run: async (context) => { await purgeExpiredUploads(context.ds, context.config); } });

function errorText(err: unknown): string {
  const e = err as AppError;
  return e instanceof AppError && e.options.hint ? `${e.message}; ${e.options.hint}` : String((err as Error)?.message ?? err).slice(0, 500);
}
