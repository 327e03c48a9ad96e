/**
 * The background job `quality-consistency-check`: runs every check over the chosen sites,
 * upserts findings by fingerprint (a re-run updates rather than repeats; a reviewed finding
 * stays reviewed), and resolves open findings of those sites that were not found again.
 */
import type { DataSource, EntityManager } from 'typeorm';
import { JobCancelled, registerJobKind } from '../jobs/registry.js';
import { duplicateSuspects, losOutliers, pneumoniaConsistency, therapyRanges, type FoundItem } from './findings.checks.js';

export const CONSISTENCY_JOB = 'quality-consistency-check';

async function upsert(ds: DataSource | EntityManager, jobId: string, items: FoundItem[]): Promise<void> {
  for (let i = 0; i < items.length; i += 1000) {
    const part = items.slice(i, i + 1000);
    await ds.query(
      `INSERT INTO quality_findings (kind, case_id, site_id, fingerprint, message, details, last_job_id)
       SELECT k, c, s, f, m, d, $1 FROM unnest($2::text[], $3::uuid[], $4::uuid[], $5::text[], $6::text[], $7::jsonb[]) AS x(k, c, s, f, m, d)
       ON CONFLICT (fingerprint) DO UPDATE SET message = EXCLUDED.message, details = EXCLUDED.details, last_found_at = now(), last_job_id = EXCLUDED.last_job_id,
         status = CASE WHEN quality_findings.status = 'resolved' THEN 'open' ELSE quality_findings.status END`,
      [jobId, part.map((x) => x.kind), part.map((x) => x.caseId), part.map((x) => x.siteId), part.map((x) => `${x.kind}:${x.caseId}:${x.key}`), part.map((x) => x.message), part.map((x) => JSON.stringify(x.details))],
    );
  }
}

registerJobKind(CONSISTENCY_JOB, async (job, tools, context) => {
  const ds = context.ds;
  const siteIds = job.payload.siteIds as string[];
  const found: FoundItem[] = [];
  const sink = (f: FoundItem) => { found.push(f); };
  const step = async (name: string, extra: Record<string, number | string> = {}) => {
    if (await tools.isCancelled()) throw new JobCancelled();
    await tools.progress({ step: name, found: found.length, ...extra });
  };
  await step('duplicates');
  await duplicateSuspects(ds, siteIds, sink);
  await step('length of stay');
  await losOutliers(ds, siteIds, sink);
  await step('pneumonia');
  const pnu = await pneumoniaConsistency(ds, siteIds, sink, (n) => step('pneumonia', { events: n }));
  await step('therapy');
  const episodes = await therapyRanges(ds, siteIds, sink, (n) => step('therapy', { episodes: n }));
  // De-duplicate within the run (one fingerprint once).
  const unique = [...new Map(found.map((f) => [`${f.kind}:${f.caseId}:${f.key}`, f])).values()];
  await ds.transaction(async (tx) => {
    await upsert(tx, job.id, unique);
    await tx.query(`UPDATE quality_findings SET status = 'resolved' WHERE site_id = ANY($1) AND status = 'open' AND last_job_id IS DISTINCT FROM $2`, [siteIds, job.id]);
  });
  const byKind: Record<string, number> = {};
  for (const f of unique) byKind[f.kind] = (byKind[f.kind] ?? 0) + 1;
  return { findings: unique.length, byKind, pneumoniaEvaluated: pnu.evaluated, pneumoniaNotEvaluable: pnu.notEvaluable, episodesChecked: episodes };
});
