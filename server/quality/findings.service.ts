/** Findings of the consistency check: start a run, list, mark reviewed (audited). */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { FindingListQuery, FindingPage } from '../../shared/quality/findings.js';
import { audit } from '../audit/audit.service.js';
import { AppError, notFound } from '../http/errors.js';
import { caseSiteScope } from '../http/scope.js';
import { enqueueJob } from '../jobs/jobs.service.js';
import type { Actor } from '../registry/case-write.js';
import { CONSISTENCY_JOB } from './findings.job.js';
import { scopedSites } from './scope.js';

export async function startCheck(ds: DataSource, user: SessionUser, siteIds: string[] | undefined): Promise<{ jobId: string; siteIds: string[] }> {
  const sites = (await scopedSites(ds, user, siteIds)).map((s) => s.id);
  const jobId = await enqueueJob(ds, CONSISTENCY_JOB, { siteIds: sites }, user.id);
  return { jobId, siteIds: sites };
}

const FINDING_SELECT = `SELECT f.*, c.registry_number, s.code AS site_code, u.email AS reviewed_by_email
  FROM quality_findings f JOIN surgical_cases c ON c.id = f.case_id JOIN sites s ON s.id = f.site_id LEFT JOIN users u ON u.id = f.reviewed_by`;

const toFinding = (r: Record<string, any>) => ({
  id: r.id, kind: r.kind, caseId: r.case_id, registryNumber: r.registry_number, siteCode: r.site_code, message: r.message, details: r.details, status: r.status,
  firstFoundAt: r.first_found_at.toISOString(), lastFoundAt: r.last_found_at.toISOString(), reviewedByEmail: r.reviewed_by_email ?? null,
  reviewedAt: r.reviewed_at ? r.reviewed_at.toISOString() : null, reviewReason: r.review_reason,
});

export async function listFindings(ds: DataSource, user: SessionUser, q: FindingListQuery): Promise<FindingPage> {
  const ids = (await scopedSites(ds, user, q.siteId)).map((s) => s.id);
  const status = q.status ?? 'open';
  const where = `WHERE f.site_id = ANY($1) AND f.status = $2 AND ($3::text IS NULL OR f.kind = $3)`;
  const args = [ids, status, q.kind ?? null];
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM quality_findings f ${where}`, args);
  const rows = await ds.query(`${FINDING_SELECT} ${where} ORDER BY f.kind, s.code, c.registry_number, f.id LIMIT $4 OFFSET $5`, [...args, q.pageSize, (q.page - 1) * q.pageSize]);
  const counts = await ds.query(`SELECT kind, count(*)::int AS n FROM quality_findings f WHERE f.site_id = ANY($1) AND f.status = $2 GROUP BY kind`, [ids, status]);
  const [last] = await ds.query(`SELECT id, created_at, status FROM jobs WHERE kind = 'quality-consistency-check' ORDER BY created_at DESC LIMIT 1`);
  return {
    items: rows.map(toFinding), total: n, page: q.page, pageSize: q.pageSize,
    counts: Object.fromEntries(counts.map((c: { kind: string; n: number }) => [c.kind, c.n])),
    lastRun: last ? { jobId: last.id, at: last.created_at.toISOString(), status: last.status } : null,
  };
}

export async function reviewFinding(ds: DataSource, id: string, reason: string, actor: Actor) {
  return ds.transaction(async (tx) => {
    const [f] = await tx.query(`SELECT * FROM quality_findings WHERE id = $1 FOR UPDATE`, [id]);
    const scope = caseSiteScope(actor.user);
    if (!f || (scope && !scope.includes(f.site_id))) throw notFound('the finding');
    if (f.status === 'reviewed') throw new AppError(409, 'already_reviewed', 'this finding was already marked reviewed', { hint: 'reload the list' });
    await tx.query(`UPDATE quality_findings SET status = 'reviewed', reviewed_by = $2, reviewed_at = now(), review_reason = $3 WHERE id = $1`, [id, actor.user.id, reason]);
    await audit(tx, [
      { action: 'finding-reviewed', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'quality-finding', entityId: id, field: 'status', oldValue: f.status, newValue: 'reviewed', reason, details: { caseId: f.case_id, kind: f.kind } },
      { action: 'finding-reviewed', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: f.case_id, field: `finding:${f.kind}`, oldValue: f.status, newValue: 'reviewed', reason },
    ]);
    const [row] = await tx.query(`${FINDING_SELECT} WHERE f.id = $1`, [id]);
    return toFinding(row);
  });
}
