/**
 * Case capture: theatre-list uploads and their match against the registry (rules in
 * shared/quality/capture.ts). Matching is one SQL statement so it stays in the database.
 */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { CaptureQuery, CaptureReport, TheatreListUpload } from '../../shared/quality/capture.js';
import { audit } from '../audit/audit.service.js';
import { assertSiteAccess } from '../http/scope.js';
import { badRequest } from '../http/errors.js';
import type { Actor } from '../registry/case-write.js';
import type { TheatreList } from './theatre-list.reader.js';
import { scopedSites } from './scope.js';

function addMonths(m: string, k: number): string {
  const [y, mo] = m.split('-').map(Number);
  const t = y * 12 + (mo - 1) + k;
  return `${Math.floor(t / 12)}-${String((t % 12) + 1).padStart(2, '0')}`;
}

export async function saveTheatreList(ds: DataSource, siteId: string, list: TheatreList, actor: Actor): Promise<TheatreListUpload> {
  assertSiteAccess(actor.user, siteId, 'the site');
  const [site] = await ds.query(`SELECT id, code FROM sites WHERE id = $1`, [siteId]);
  if (!site) throw badRequest('the site does not exist', 'choose one of your sites', [{ path: 'siteId', message: 'is not a known site' }]);
  const dates = list.rows.map((r) => r.operationDate).sort();
  const fromDate = dates[0];
  const toDate = dates[dates.length - 1];
  const id = await ds.transaction(async (tx) => {
    // A new list for the same dates replaces the earlier one (a corrected export from theatres).
    const del = await tx.query(`DELETE FROM theatre_list_entries WHERE site_id = $1 AND operation_date BETWEEN $2 AND $3`, [siteId, fromDate, toDate]);
    const replaced = Number(del?.[1] ?? 0);
    const [u] = await tx.query(
      `INSERT INTO theatre_list_uploads (site_id, created_by, file_hash, rows, from_date, to_date, replaced) VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
      [siteId, actor.user.id, list.fileHash, list.rows.length, fromDate, toDate, replaced],
    );
    for (let i = 0; i < list.rows.length; i += 5000) {
      const part = list.rows.slice(i, i + 5000);
      await tx.query(
        `INSERT INTO theatre_list_entries (upload_id, site_id, operation_date, procedure_category, identifier_hash)
         SELECT $1, $2, d, c, h FROM unnest($3::date[], $4::text[], $5::text[]) AS x(d, c, h)`,
        [u.id, siteId, part.map((r) => r.operationDate), part.map((r) => r.procedureCategory), part.map((r) => r.identifierHash)],
      );
    }
    await audit(tx, {
      action: 'theatre-list-uploaded', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'theatre-list-upload', entityId: u.id,
      details: { siteId, rows: list.rows.length, fromDate, toDate, replaced, fileHash: list.fileHash },
    });
    return u.id as string;
  });
  return (await listUploads(ds, [siteId], id))[0];
}

async function listUploads(ds: DataSource, siteIds: string[], id?: string): Promise<TheatreListUpload[]> {
  const rows = await ds.query(
    `SELECT u.id, u.site_id, s.code AS site_code, u.rows, u.from_date::text AS from_date, u.to_date::text AS to_date, u.replaced, u.created_at, us.email
       FROM theatre_list_uploads u JOIN sites s ON s.id = u.site_id LEFT JOIN users us ON us.id = u.created_by
      WHERE u.site_id = ANY($1) AND ($2::uuid IS NULL OR u.id = $2) ORDER BY u.created_at DESC LIMIT 20`,
    [siteIds, id ?? null],
  );
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id, siteId: r.site_id, siteCode: r.site_code, rows: r.rows, fromDate: r.from_date, toDate: r.to_date, replaced: r.replaced,
    createdAt: (r.created_at as Date).toISOString(), createdByEmail: r.email ?? null,
  })) as TheatreListUpload[];
}

/** The matching, as CTEs over sites $1 and operation/surgery dates in [$2, $3). */
const MATCH_SQL = `
WITH t AS (
  SELECT e.id, e.site_id, e.operation_date AS d, e.procedure_category AS cat, e.identifier_hash AS h,
         row_number() OVER (PARTITION BY e.site_id, e.identifier_hash, e.operation_date ORDER BY e.id) AS rn
    FROM theatre_list_entries e WHERE e.site_id = ANY($1) AND e.operation_date >= $2::date AND e.operation_date < $3::date
), c AS (
  SELECT sc.id, sc.site_id, sc.surgery_date AS d, sc.procedure_category AS cat, sc.identifier_hash AS h,
         row_number() OVER (PARTITION BY sc.site_id, sc.identifier_hash, sc.surgery_date ORDER BY sc.id) AS rn
    FROM surgical_cases sc WHERE sc.status <> 'withdrawn' AND sc.site_id = ANY($1) AND sc.surgery_date >= $2::date AND sc.surgery_date < $3::date
), m1 AS (
  SELECT t.id AS tid, c.id AS cid FROM t JOIN c ON c.site_id = t.site_id AND c.h = t.h AND c.d = t.d AND c.rn = t.rn
), t2 AS (
  SELECT t.*, row_number() OVER (PARTITION BY t.site_id, t.d, t.cat ORDER BY t.id) AS rn2 FROM t WHERE NOT EXISTS (SELECT 1 FROM m1 WHERE m1.tid = t.id)
), c2 AS (
  SELECT c.*, row_number() OVER (PARTITION BY c.site_id, c.d, c.cat ORDER BY c.id) AS rn2 FROM c WHERE c.h IS NULL AND NOT EXISTS (SELECT 1 FROM m1 WHERE m1.cid = c.id)
), m2 AS (
  SELECT t2.id AS tid, c2.id AS cid FROM t2 JOIN c2 ON c2.site_id = t2.site_id AND c2.d = t2.d AND c2.cat = t2.cat AND c2.rn2 = t2.rn2
)`;

export async function captureReport(ds: DataSource, user: SessionUser, q: CaptureQuery): Promise<CaptureReport> {
  const sites = await scopedSites(ds, user, q.siteId);
  const ids = sites.map((s) => s.id);
  let to = q.to;
  if (!to) {
    const [r] = await ds.query(`SELECT to_char(max(operation_date), 'YYYY-MM') AS m FROM theatre_list_entries WHERE site_id = ANY($1)`, [ids]);
    to = r?.m ?? new Date().toISOString().slice(0, 7);
  }
  const from = q.from ?? addMonths(to!, -11);
  const args = [ids, `${from}-01`, `${addMonths(to!, 1)}-01`];
  const months = await ds.query(
    `${MATCH_SQL},
    per AS (
      SELECT site_id, to_char(d, 'YYYY-MM') AS month, count(*)::int AS listed,
             count(*) FILTER (WHERE EXISTS (SELECT 1 FROM m1 WHERE m1.tid = t.id))::int AS by_id,
             count(*) FILTER (WHERE EXISTS (SELECT 1 FROM m2 WHERE m2.tid = t.id))::int AS by_date
        FROM t GROUP BY 1, 2
    ), cases AS (
      SELECT site_id, to_char(d, 'YYYY-MM') AS month,
             count(*) FILTER (WHERE NOT EXISTS (SELECT 1 FROM m1 WHERE m1.cid = c.id) AND NOT EXISTS (SELECT 1 FROM m2 WHERE m2.cid = c.id))::int AS not_on_list
        FROM c GROUP BY 1, 2
    )
    SELECT COALESCE(per.site_id, cases.site_id) AS site_id, s.code AS site_code, COALESCE(per.month, cases.month) AS month,
           COALESCE(per.listed, 0) AS listed, COALESCE(per.by_id, 0) AS by_id, COALESCE(per.by_date, 0) AS by_date, COALESCE(cases.not_on_list, 0) AS not_on_list
      FROM per FULL JOIN cases ON cases.site_id = per.site_id AND cases.month = per.month
      JOIN sites s ON s.id = COALESCE(per.site_id, cases.site_id)
     ORDER BY s.code, 3`,
    args,
  );
  const missing = await ds.query(
    `${MATCH_SQL}
    SELECT t.id, t.site_id, s.code AS site_code, t.d::text AS d, t.cat, to_char(t.d, 'YYYY-MM') AS month, count(*) OVER ()::int AS total
      FROM t JOIN sites s ON s.id = t.site_id
     WHERE NOT EXISTS (SELECT 1 FROM m1 WHERE m1.tid = t.id) AND NOT EXISTS (SELECT 1 FROM m2 WHERE m2.tid = t.id)
     ORDER BY t.d DESC, s.code, t.cat, t.id LIMIT 200`,
    args,
  );
  return {
    months: months.map((r: Record<string, number | string>) => {
      const listed = Number(r.listed);
      const matched = Number(r.by_id) + Number(r.by_date);
      return {
        siteId: String(r.site_id), siteCode: String(r.site_code), month: String(r.month), listed,
        matchedByIdentifier: Number(r.by_id), matchedByDate: Number(r.by_date), missing: listed - matched,
        capture: listed ? matched / listed : null, notOnList: Number(r.not_on_list),
      };
    }),
    missing: missing.map((r: Record<string, string>) => ({ entryId: r.id, siteId: r.site_id, siteCode: r.site_code, operationDate: r.d, procedureCategory: r.cat, month: r.month })),
    missingTotal: missing[0]?.total ?? 0,
    uploads: await listUploads(ds, ids),
  };
}
