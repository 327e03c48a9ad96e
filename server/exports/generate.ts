/**
 * The background job that writes an approved export (registerJobKind): rows come from a
 * server-side cursor (DECLARE ... CURSOR in a read-only repeatable-read transaction, FETCH in
 * batches), are de-identified one by one and streamed into the file, so memory does not grow
 * with the export. The file is written under a temporary name and renamed when complete.
 */
import { createHash, randomBytes, randomInt } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, rename, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { DataSource } from 'typeorm';
import { CohortFilterSchema } from '../../shared/analysis/cohort-filter.js';
import { perExportCodes, studyIdGenerator } from '../../shared/exports/deid.js';
import type { KAnonymitySummary } from '../../shared/exports/k-anonymity.js';
import { STUDY_ID_VARIABLE, type ExportVariable } from '../../shared/exports/variables.js';
import { audit } from '../audit/audit.service.js';
import type { AppContext } from '../context.js';
import { JobCancelled, registerJobKind, type JobTools } from '../jobs/registry.js';
import { aggregateRows, buildAggregate } from './aggregate.js';
import { resolveDimension, resolveVariables } from './catalog.js';
import { EXPORT_JOB_KIND } from './exports.service.js';
import { todayIn } from '../../shared/registry/derived.js';
import { countSql, exportRowsSql, quasiIdentifiersOf } from './query.js';
import { DICTIONARY_HEADER, dictionaryRows, readmeLines } from './readme.js';
import { rowTransformer, type TransformContext } from './transform.js';
import { openCsvZip } from './writers/csv.js';
import type { FileParts, RowSink } from './writers/types.js';
import { openXlsx } from './writers/xlsx.js';

export function exportDir(context: AppContext): string {
  return join(context.config.DATA_DIR, 'exports');
}

const cryptoRandom = () => randomInt(0, 2 ** 32) / 2 ** 32;

/** crypto.randomBytes drawn 64 KiB at a time (one call per row cost a second per 200,000 rows). */
function pooledRandomBytes(): (n: number) => Uint8Array {
  let pool = randomBytes(65_536);
  let at = 0;
  return (n) => {
    if (at + n > pool.length) {
      pool = randomBytes(65_536);
      at = 0;
    }
    const out = pool.subarray(at, at + n);
    at += n;
    return out;
  };
}

async function codes(ds: DataSource, siteNames: boolean): Promise<{ siteLabel: Map<string, string>; unitCode: Map<string, string>; names: Map<string, string> }> {
  const sites: { id: string; name: string }[] = await ds.query(`SELECT id, name FROM sites ORDER BY id`);
  const units: { id: string }[] = await ds.query(`SELECT id FROM units ORDER BY id`);
  const names = new Map(sites.map((s) => [s.id, s.name]));
  return {
    siteLabel: siteNames ? names : perExportCodes(sites.map((s) => s.id), 'Site', cryptoRandom),
    unitCode: perExportCodes(units.map((u) => u.id), 'Unit', cryptoRandom),
    names,
  };
}

const FETCH_ROWS = 1000;

/**
 * Streams the cursor's rows (as arrays: no object per row) through `each`; checks for
 * cancellation and reports progress. The next batch is fetched while this one is written, so
 * the database and the writer work at the same time (the cursor's fast-start plan streams rows
 * from the first moment; see query.ts).
 */
async function streamRows(ds: DataSource, sql: string, params: unknown[], each: (row: unknown[]) => Promise<void>, tools: JobTools, total: number): Promise<number> {
  const qr = ds.createQueryRunner();
  const client = (await qr.connect()) as { query: (q: { text: string; values?: unknown[]; rowMode?: 'array' }) => Promise<{ rows: unknown[][] }> };
  let written = 0;
  try {
    await client.query({ text: 'BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY' });
    await client.query({ text: `SET LOCAL work_mem = '64MB'` });
    await client.query({ text: `DECLARE export_rows NO SCROLL CURSOR FOR ${sql}`, values: params });
    const fetch = () => client.query({ text: `FETCH ${FETCH_ROWS} FROM export_rows`, rowMode: 'array' });
    let next = fetch();
    for (;;) {
      const { rows } = await next;
      if (!rows.length) break;
      next = fetch();
      next.catch(() => undefined); // handled when awaited
      for (const r of rows) await each(r);
      written += rows.length;
      if (written % 10_000 < FETCH_ROWS) {
        if (await tools.isCancelled()) throw new JobCancelled();
        await tools.progress({ written, total, phase: 'writing' });
      }
    }
    await client.query({ text: 'COMMIT' });
  } catch (err) {
    await client.query({ text: 'ROLLBACK' }).catch(() => undefined);
    throw err;
  } finally {
    await qr.release();
  }
  return written;
}

export interface GenerateOptions { maxRowsPerSheet?: number }

/** Writes the file of an approved request; returns what the job result records. */
export async function generateExport(context: AppContext, requestId: string, tools: JobTools, opts: GenerateOptions = {}): Promise<Record<string, unknown>> {
  const { ds, config } = context;
  const readDs = context.readDs;
  const [row] = await ds.query(`SELECT r.*, to_char(r.dua_expires_on, 'YYYY-MM-DD') AS dua_expires_text, d.display_name AS approver FROM export_requests r LEFT JOIN users d ON d.id = r.decided_by WHERE r.id = $1`, [requestId]);
  if (!row) throw new Error('the export request no longer exists');
  if (!['approved', 'failed', 'generating'].includes(row.status)) throw new Error(`the export request is ${row.status}, not approved`);
  const dua = row.dua_reference ? { reference: row.dua_reference as string, expiresOn: row.dua_expires_text as string } : null;
  // No limited data set after its agreement expires, even if approved before.
  if (row.level === 'limited' && (!dua || dua.expiresOn < todayIn(config.NETWORK_TIME_ZONE))) {
    await ds.query(`UPDATE export_requests SET status = 'failed' WHERE id = $1`, [requestId]);
    throw new Error(`the data-use agreement ${dua?.reference ?? ''} expired on ${dua?.expiresOn ?? '?'}: a limited data set cannot be generated after it expires`);
  }
  await ds.query(`UPDATE export_requests SET status = 'generating' WHERE id = $1`, [requestId]);
  const cohort = CohortFilterSchema.parse(row.cohort ?? {});
  const coarsen = row.risk_action === 'coarsen' || row.risk_action === 'coarsen-and-suppress';
  const suppress = row.risk_action === 'suppress' || row.risk_action === 'coarsen-and-suppress';
  const level = row.level as 'deidentified' | 'limited';
  const { siteLabel, unitCode, names } = await codes(readDs, row.site_names_approved);
  const t: TransformContext = { level, coarsen, siteLabel, unitCode, nextStudyId: studyIdGenerator(pooledRandomBytes()) };

  const dir = exportDir(context);
  await mkdir(dir, { recursive: true });
  const ext = row.format === 'xlsx' ? 'xlsx' : 'zip';
  const finalPath = join(dir, `${requestId}.${ext}`);
  const tmpPath = `${finalPath}.part`;
  const generatedAt = new Date();
  let expiresAt = new Date(generatedAt.getTime() + config.EXPORT_RETENTION_HOURS * 3_600_000);
  if (dua) expiresAt = new Date(Math.min(expiresAt.getTime(), Date.parse(`${dua.expiresOn}T23:59:59Z`)));
  const base = { requestId, purpose: row.purpose, cohort, kind: row.kind, level, dua, approver: row.approver ?? 'an administrator', approvedAt: new Date(row.decided_at), generatedAt, expiresAt,
    siteNamesApproved: row.site_names_approved, siteNames: names, riskAction: row.risk_action, risk: row.risk as KAnonymitySummary | null };
  const open = (parts: FileParts): RowSink =>
    row.format === 'xlsx' ? openXlsx(tmpPath, parts, { maxRowsPerSheet: opts.maxRowsPerSheet }) : openCsvZip(tmpPath, parts, { data: 'data.csv', dictionary: 'dictionary.csv', readme: 'README.txt' });

  let sink: RowSink | null = null;
  let rows = 0;
  let sheets = 1;
  try {
    if (row.kind === 'aggregate') {
      const rowsBy = resolveDimension(row.rows_by, 'rowsBy')!;
      const colsBy = resolveDimension(row.cols_by ?? undefined, 'colsBy');
      await tools.progress({ written: 0, total: 1, phase: 'counting' });
      const table = await buildAggregate(readDs, cohort, rowsBy, colsBy, t);
      const out = aggregateRows(table, rowsBy, colsBy);
      const dims: ExportVariable[] = colsBy ? [rowsBy, colsBy] : [rowsBy];
      sink = open({
        header: out.header, dictionaryHeader: DICTIONARY_HEADER,
        dictionary: [...dictionaryRows(dims, { coarsen }).slice(1), ['cases', 'Number of cases', 'whole number or "suppressed"', 'cases', '', 'Cases of the cohort in the cell; "suppressed" hides a count from 1 to 10 or a count that would reveal one.', 'CMS cell-size suppression policy (counts 1–10), complementary suppression']],
        readme: readmeLines({ ...base, kind: 'aggregate', quasiIdentifiers: [], rows: table.total }),
      });
      for (const r of out.rows) await sink.row(r);
      rows = out.rows.length;
      ({ sheets } = await sink.finish());
      await tools.progress({ written: 1, total: 1, phase: 'done' });
    } else {
      const variables = resolveVariables(row.fields, 'fields');
      // Coarsening drops the unit codes (one more quasi-identifier) from the file.
      const kept = coarsen ? variables.filter((v) => v.name !== 'unit') : variables;
      const input = { cohort, variables: kept, level, coarsen, suppress };
      const [{ n: total }] = await readDs.query(countSql(input).sql, countSql(input).params);
      await tools.progress({ written: 0, total, phase: 'writing' });
      const q = exportRowsSql(input);
      const sheetsNeeded = row.format === 'xlsx' ? Math.max(1, Math.ceil(total / ((opts.maxRowsPerSheet ?? 1_048_576) - 1))) : 1;
      sink = open({
        header: [STUDY_ID_VARIABLE.name, ...kept.map((v) => v.name)], dictionaryHeader: DICTIONARY_HEADER,
        dictionary: dictionaryRows(kept, { coarsen }),
        readme: readmeLines({ ...base, kind: 'rows', quasiIdentifiers: quasiIdentifiersOf(kept), rows: total, sheets: sheetsNeeded }),
      });
      const transform = rowTransformer(kept, t);
      const s = sink;
      rows = await streamRows(readDs, q.sql, q.params, (r) => s.row(transform(r)), tools, total);
      ({ sheets } = await sink.finish());
      await tools.progress({ written: rows, total, phase: 'done' });
    }
    await rename(tmpPath, finalPath);
  } catch (err) {
    await sink?.abort().catch(() => undefined);
    await rm(tmpPath, { force: true });
    await ds.query(`UPDATE export_requests SET status = 'failed' WHERE id = $1`, [requestId]);
    await audit(ds, { action: 'export-generate-failed', entity: 'export_request', entityId: requestId, details: { error: (err as Error).message.slice(0, 500) } });
    throw err;
  }
  const bytes = (await stat(finalPath)).size;
  const sha256 = await new Promise<string>((resolve, reject) => {
    const h = createHash('sha256');
    createReadStream(finalPath).on('data', (b) => h.update(b)).on('end', () => resolve(h.digest('hex'))).on('error', reject);
  });
  const fileName = `alveolog-export-${requestId.slice(0, 8)}-${generatedAt.toISOString().slice(0, 10)}.${ext}`;
  await ds.transaction(async (tx) => {
    await tx.query(
      `UPDATE export_requests SET status = 'ready', file_path = $2, file_name = $3, file_bytes = $4, file_sha256 = $5, row_count = $6, sheet_count = $7, generated_at = $8, expires_at = $9 WHERE id = $1`,
      [requestId, finalPath, fileName, bytes, sha256, rows, sheets, generatedAt, expiresAt],
    );
    await audit(tx, { action: 'export-generate', entity: 'export_request', entityId: requestId, details: { rows, sheets, bytes, sha256, format: row.format, expiresAt: expiresAt.toISOString() } });
  });
  const [requester] = await ds.query(`SELECT email FROM users WHERE id = $1`, [row.requester_id]);
  if (requester) {
    await context.mailer.send({
      to: requester.email,
      subject: 'Alveolog: your research export is ready',
      text: `Your export (${rows} ${row.kind === 'aggregate' ? 'table rows' : 'rows'}, ${row.format}) is ready to download from Research > My exports until ${expiresAt.toISOString().replace('T', ' ').slice(0, 16)} UTC; then it is deleted.\n${config.APP_URL ? `${config.APP_URL}/research/exports\n` : ''}`,
    });
  }
  return { requestId, rows, sheets, bytes };
}

registerJobKind(EXPORT_JOB_KIND, async (job, tools, context) => generateExport(context, String(job.payload.requestId), tools));
