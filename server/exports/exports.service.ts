/**
 * Research export requests: create, list, read, the k-anonymity report, the approver's decision,
 * and the audit log of the area. Plain functions (no req/res); the router parses and sends.
 */
import { todayIn } from '../../shared/registry/derived.js';
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { CohortFilterSchema, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { kAnonymity, K_THRESHOLD, QUASI_IDENTIFIER_LABELS, type KAnonymitySummary } from '../../shared/exports/k-anonymity.js';
import {
  type ExportAuditEntry,
  type ExportDecision,
  type ExportRequestCreate,
  type ExportRequestView,
  type RiskReport,
} from '../../shared/exports/schemas.js';
import { audit, type AuditInput } from '../audit/audit.service.js';
import type { Config } from '../config.js';
import { AppError, badRequest, conflict, notFound } from '../http/errors.js';
import type { Mailer } from '../mail/mailer.js';
import { resolveDimension, resolveVariables } from './catalog.js';
import { classSizesSql, countSql } from './query.js';

export const EXPORT_JOB_KIND = 'research-export';

type Actor = Pick<AuditInput, 'actorId' | 'actorEmail' | 'ip'>;

function assertDuaCurrent(dua: { reference: string; expiresOn: string } | null, level: string, config: Config, path = 'dua.expiresOn') {
  if (level !== 'limited') return;
  if (!dua) throw badRequest('a limited data set needs a data-use agreement', 'enter its reference and expiry date', [{ path: 'dua', message: 'required for a limited data set' }]);
  const today = todayIn(config.NETWORK_TIME_ZONE);
  if (dua.expiresOn < today) {
    throw new AppError(400, 'dua_expired', `the data-use agreement ${dua.reference} expired on ${dua.expiresOn}: no limited data set is released after it expires`, {
      hint: 'renew the agreement and enter its new expiry date, or request a fully de-identified set',
      fields: [{ path, message: `expired on ${dua.expiresOn}` }],
    });
  }
}

const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);

function toView(r: Record<string, any>, user: SessionUser): ExportRequestView {
  // A job that died with its server (failed or cancelled) leaves the request 'generating': show it as failed.
  if ((r.status === 'generating' || r.status === 'approved') && (r.job_status === 'failed' || r.job_status === 'cancelled')) r = { ...r, status: 'failed' };
  const ready = r.status === 'ready' && r.expires_at && new Date(r.expires_at) > new Date() && !r.deleted_at;
  return {
    id: r.id,
    requester: { id: r.requester_id, displayName: r.requester_name, email: r.requester_email },
    purpose: r.purpose,
    cohort: r.cohort ?? {},
    kind: r.kind,
    fields: r.fields ?? [],
    rowsBy: r.rows_by,
    colsBy: r.cols_by,
    format: r.format,
    level: r.level,
    dua: r.dua_reference ? { reference: r.dua_reference, expiresOn: r.dua_expires_text } : null,
    siteNamesRequested: r.site_names_requested,
    status: r.status,
    decidedBy: r.decider_name ?? null,
    decidedAt: iso(r.decided_at),
    decisionReason: r.decision_reason,
    siteNamesApproved: r.site_names_approved,
    riskAction: r.risk_action,
    risk: r.risk ?? null,
    jobId: r.job_id,
    progress: r.job_progress ?? null,
    error: r.status === 'failed' ? r.job_error ?? 'generation failed' : null,
    file: r.file_name ? { name: r.file_name, bytes: Number(r.file_bytes), rows: r.row_count, sheets: r.sheet_count ?? 1 } : null,
    expiresAt: iso(r.expires_at),
    createdAt: iso(r.created_at)!,
    canDownload: !!ready && r.requester_id === user.id,
  };
}

const SELECT = `SELECT r.*, to_char(r.dua_expires_on, 'YYYY-MM-DD') AS dua_expires_text, u.display_name AS requester_name, u.email AS requester_email, d.display_name AS decider_name,
    j.progress AS job_progress, j.error AS job_error, j.status AS job_status
  FROM export_requests r JOIN users u ON u.id = r.requester_id LEFT JOIN users d ON d.id = r.decided_by LEFT JOIN jobs j ON j.id = r.job_id`;

/** Raw row of a request the user may see (the requester or an admin); others get 404. */
export async function loadRequest(ds: DataSource, user: SessionUser, id: string): Promise<Record<string, any>> {
  const [row] = await ds.query(`${SELECT} WHERE r.id = $1`, [id]);
  if (!row || (row.requester_id !== user.id && !user.roles.includes('admin'))) throw notFound('the export request');
  return row;
}

export async function getRequest(ds: DataSource, user: SessionUser, id: string): Promise<ExportRequestView> {
  return toView(await loadRequest(ds, user, id), user);
}

export async function listRequests(ds: DataSource, user: SessionUser, scope: 'mine' | 'all', status?: string): Promise<{ items: ExportRequestView[] }> {
  const all = scope === 'all' && user.roles.includes('admin');
  const params: unknown[] = [];
  const where: string[] = [];
  if (!all) where.push(`r.requester_id = $${params.push(user.id)}`);
  if (status) where.push(`r.status = $${params.push(status)}`);
  const rows = await ds.query(`${SELECT} ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY r.created_at DESC LIMIT 500`, params);
  return { items: rows.map((r: Record<string, any>) => toView(r, user)) };
}

/** Cases of the cohort (counted statuses only). */
export async function cohortSize(ds: DataSource, cohort: CohortFilter): Promise<number> {
  const q = countSql({ cohort, variables: [], level: 'deidentified', coarsen: false, suppress: false });
  const [row] = await ds.query(q.sql, q.params);
  return row.n;
}

export interface RequestContext { ds: DataSource; readDs: DataSource; config: Config; mailer: Mailer; appUrl: string }

export async function createRequest(c: RequestContext, user: SessionUser, input: ExportRequestCreate, who: Actor): Promise<ExportRequestView> {
  const variables = input.kind === 'rows' ? resolveVariables(input.fields, 'fields') : [];
  const rowsBy = input.kind === 'aggregate' ? resolveDimension(input.rowsBy, 'rowsBy') : null;
  const colsBy = input.kind === 'aggregate' ? resolveDimension(input.colsBy, 'colsBy') : null;
  assertDuaCurrent(input.dua ?? null, input.level, c.config);
  const n = await cohortSize(c.readDs, input.cohort);
  if (input.kind === 'rows' && input.format === 'xlsx') {
    const cells = n * (variables.length + 1);
    if (cells > c.config.EXPORT_XLSX_MAX_CELLS) {
      throw new AppError(400, 'too_large_for_xlsx', `this export would be ${n.toLocaleString('en')} rows x ${variables.length + 1} columns = ${cells.toLocaleString('en')} cells, above the xlsx limit of ${c.config.EXPORT_XLSX_MAX_CELLS.toLocaleString('en')} cells`, {
        hint: 'choose CSV (no size limit: it is streamed), or fewer fields or a narrower cohort',
        fields: [{ path: 'format', message: 'too large for xlsx: choose csv' }],
        details: { rows: n, columns: variables.length + 1, limit: c.config.EXPORT_XLSX_MAX_CELLS },
      });
    }
  }
  const fields = input.kind === 'rows' ? variables.map((v) => v.name) : [];
  const view = await c.ds.transaction(async (tx) => {
    const [row] = await tx.query(
      `INSERT INTO export_requests (requester_id, purpose, cohort, kind, fields, rows_by, cols_by, format, level, dua_reference, dua_expires_on, site_names_requested)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12) RETURNING id`,
      [user.id, input.purpose, JSON.stringify(input.cohort), input.kind, fields, rowsBy?.name ?? null, colsBy?.name ?? null, input.format, input.level,
        input.level === 'limited' ? input.dua!.reference : null, input.level === 'limited' ? input.dua!.expiresOn : null, input.siteNamesRequested],
    );
    await audit(tx, { ...who, action: 'export-request', entity: 'export_request', entityId: row.id, details: { kind: input.kind, format: input.format, level: input.level, fields, rowsBy: rowsBy?.name ?? null, colsBy: colsBy?.name ?? null, cohortCases: n, siteNamesRequested: input.siteNamesRequested } });
    return row.id as string;
  });
  const admins: { email: string }[] = await c.ds.query(`SELECT email FROM users WHERE 'admin' = ANY(roles) AND active`);
  if (admins.length) {
    await c.mailer.send({
      to: admins.map((a) => a.email),
      subject: 'Alveolog: a research export request is waiting for approval',
      text: `${user.displayName} asked for a ${input.level === 'limited' ? 'limited' : 'fully de-identified'} ${input.kind === 'aggregate' ? 'aggregate table' : 'dataset'} (${input.format}) of ${n} cases.\n\nReview it: ${c.appUrl}/research/approvals\n`,
    });
  }
  return getRequest(c.ds, user, view);
}

/** The k-anonymity check over the export's quasi-identifiers, as requested and after coarsening. */
export async function riskReport(ds: DataSource, row: Record<string, any>): Promise<RiskReport & { sizes: { asRequested: number[]; coarsened: number[] } }> {
  const cohort = CohortFilterSchema.parse(row.cohort ?? {});
  const variables = row.kind === 'rows' ? resolveVariables(row.fields, 'fields') : [];
  const sizes = async (coarsen: boolean): Promise<{ s: KAnonymitySummary; q: string[]; n: number[] }> => {
    // Coarsening drops the unit codes, as the generated file does.
    const q = classSizesSql({ cohort, variables: coarsen ? variables.filter((v) => v.name !== 'unit') : variables, level: row.level, coarsen });
    const rows: { n: number }[] = await ds.query(q.sql, q.params);
    const n = rows.map((r) => r.n);
    return { s: kAnonymity(n), q: q.quasiIdentifiers, n };
  };
  const asRequested = await sizes(false);
  const coarsened = await sizes(true);
  const applies = row.kind === 'rows';
  const labels = asRequested.q.map((q) => QUASI_IDENTIFIER_LABELS[q as keyof typeof QUASI_IDENTIFIER_LABELS]);
  const message = !applies
    ? 'An aggregate table: small cells are suppressed instead (counts 1–10, with complementary suppression).'
    : asRequested.s.k >= K_THRESHOLD || asRequested.s.records === 0
      ? `Every combination of ${labels.join(', ') || 'the quasi-identifiers'} holds at least ${K_THRESHOLD} records (k = ${asRequested.s.k}).`
      : `${asRequested.s.classesBelow} combination${asRequested.s.classesBelow === 1 ? '' : 's'} of ${labels.join(', ')} hold fewer than ${K_THRESHOLD} records (${asRequested.s.recordsBelow} records; smallest k = ${asRequested.s.k}). Coarsen (k would be ${coarsened.s.k}) or suppress those records before approving.`;
  return { quasiIdentifiers: asRequested.q, asRequested: asRequested.s, coarsened: coarsened.s, applies, message, sizes: { asRequested: asRequested.n, coarsened: coarsened.n } };
}

/** The k-anonymity of the file that the chosen action produces (coarsening, then suppression of classes under k). */
export function riskAfter(r: { sizes: { asRequested: number[]; coarsened: number[] } }, action: string): KAnonymitySummary {
  const coarse = action === 'coarsen' || action === 'coarsen-and-suppress';
  const suppress = action === 'suppress' || action === 'coarsen-and-suppress';
  const sizes = coarse ? r.sizes.coarsened : r.sizes.asRequested;
  return kAnonymity(suppress ? sizes.filter((n) => n >= K_THRESHOLD) : sizes);
}

export async function decide(c: RequestContext, user: SessionUser, id: string, d: ExportDecision, who: Actor): Promise<ExportRequestView> {
  const row = await loadRequest(c.ds, user, id);
  if (row.status !== 'pending') throw conflict(`this request is already ${row.status}`, { status: row.status }, 'reload the list of requests');
  if (row.requester_id === user.id) throw new AppError(403, 'own_request', 'you cannot decide on your own export request', { hint: 'ask another administrator to review it' });
  const requester = { email: row.requester_email as string, name: row.requester_name as string };
  if (d.decision === 'decline') {
    await c.ds.transaction(async (tx) => {
      await tx.query(`UPDATE export_requests SET status = 'declined', decided_by = $2, decided_at = now(), decision_reason = $3 WHERE id = $1`, [id, user.id, d.reason]);
      await audit(tx, { ...who, action: 'export-decline', entity: 'export_request', entityId: id, reason: d.reason });
    });
    await c.mailer.send({ to: requester.email, subject: 'Alveolog: your research export request was declined', text: `Your export request of ${new Date(row.created_at).toISOString().slice(0, 10)} was declined.\n\nReason: ${d.reason}\n\nSee your requests: ${c.appUrl}/research/exports\n` });
    return getRequest(c.ds, user, id);
  }
  assertDuaCurrent(row.dua_reference ? { reference: row.dua_reference, expiresOn: row.dua_expires_text } : null, row.level, c.config, 'decision');
  const risk = await riskReport(c.readDs, row);
  const below = risk.applies && risk.asRequested.records > 0 && risk.asRequested.k < K_THRESHOLD;
  if (below && d.riskAction === 'none' && !d.acceptRisk) {
    throw new AppError(409, 'k_anonymity_below_threshold', risk.message, {
      hint: 'choose coarsen or suppress (or accept the risk explicitly) and approve again',
      details: risk,
    });
  }
  const siteNames = d.siteNamesApproved && row.site_names_requested;
  await c.ds.transaction(async (tx) => {
    const [job] = await tx.query(`INSERT INTO jobs (kind, payload, created_by) VALUES ($1, $2, $3) RETURNING id`, [EXPORT_JOB_KIND, JSON.stringify({ requestId: id }), row.requester_id]);
    await tx.query(
      `UPDATE export_requests SET status = 'approved', decided_by = $2, decided_at = now(), decision_reason = $3, site_names_approved = $4, risk_action = $5, risk = $6, job_id = $7 WHERE id = $1`,
      [id, user.id, d.reason, siteNames, risk.applies ? d.riskAction : 'none', JSON.stringify(risk.applies ? riskAfter(risk, d.riskAction) : null), job.id],
    );
    await audit(tx, { ...who, action: 'export-approve', entity: 'export_request', entityId: id, reason: d.reason, details: { siteNamesApproved: siteNames, riskAction: d.riskAction, acceptRisk: d.acceptRisk, k: risk.asRequested.k, kAfter: risk.applies ? riskAfter(risk, d.riskAction).k : null, classesBelow: risk.asRequested.classesBelow, jobId: job.id } });
  });
  await c.mailer.send({ to: requester.email, subject: 'Alveolog: your research export request was approved', text: `Your export request was approved by ${user.displayName}.\n\nReason: ${d.reason}\n\nThe file is being generated; you will get another e-mail when it is ready to download at ${c.appUrl}/research/exports\n` });
  return getRequest(c.ds, user, id);
}

/** The export area's audit log (admins), newest first. */
export async function auditLog(ds: DataSource, q: { page: number; pageSize: number; requestId?: string }): Promise<{ items: ExportAuditEntry[]; total: number; page: number; pageSize: number }> {
  const params: unknown[] = [];
  const where = [`action LIKE 'export-%'`];
  if (q.requestId) where.push(`entity_id = $${params.push(q.requestId)}`);
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE ${where.join(' AND ')}`, params);
  const rows = await ds.query(`SELECT id::text, at, action, actor_email, entity_id, reason, details FROM audit_entries WHERE ${where.join(' AND ')} ORDER BY at DESC, id DESC LIMIT $${params.push(q.pageSize)} OFFSET $${params.push((q.page - 1) * q.pageSize)}`, params);
  return { items: rows.map((r: Record<string, any>) => ({ id: r.id, at: iso(r.at)!, action: r.action, actorEmail: r.actor_email, requestId: r.entity_id, reason: r.reason, details: r.details })), total: n, page: q.page, pageSize: q.pageSize };
}
