/**
 * Research export speed and memory (issue 8): 200,000 cases x 60 columns (study id + 59
 * variables, including the per-case outcome and therapy summaries), through the real generation
 * job (server/exports/generate.ts: server-side cursor, de-identification per row, streaming
 * writer). Targets: CSV < 20 s and peak RSS < 250 MB; xlsx < 60 s and peak RSS < 700 MB.
 * CSV runs first so that its RSS is not inflated by the xlsx run's heap. The xlsx run at two
 * sizes shows how RSS grows with the cell count, from which EXPORT_XLSX_MAX_CELLS is set.
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Bench } from './harness.js';
import { loadConfig } from '../../server/config.js';
import type { AppContext } from '../../server/context.js';
import { generateExport } from '../../server/exports/generate.js';
import { currentCatalog } from '../../server/exports/catalog.js';
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';

const TARGET_CASES = 200_000;

export default async function exportsBench(b: Bench): Promise<void> {
  const dataDir = mkdtempSync(join(tmpdir(), 'alveolog-export-bench-'));
  const config = loadConfig({ DATABASE_URL: 'postgres://unused', SESSION_SECRET: 's'.repeat(40), IDENTIFIER_HASH_SECRET: 'h'.repeat(40), DATA_DIR: dataDir, EXPORT_XLSX_MAX_CELLS: String(1e12) } as NodeJS.ProcessEnv);
  const context: AppContext = { ds: b.ds, readDs: b.ds, config, mailer: { send: async () => undefined, close: () => undefined } };
  const fields = currentCatalog().slice(0, 59).map((v) => v.name);
  const [admin] = await b.ds.query(`SELECT id FROM users WHERE 'admin' = ANY(roles) LIMIT 1`);
  const [researcher] = await b.ds.query(`SELECT id FROM users WHERE 'researcher' = ANY(roles) LIMIT 1`);

  // A cohort of about 200,000 counted cases: surgery dates from 2023-01-01 up to the day that reaches it.
  const [{ d }] = await b.ds.query(
    `SELECT max(surgery_date)::text AS d FROM (SELECT surgery_date FROM analysis_case_facts WHERE surgery_date >= '2023-01-01' AND status IN (2, 3, 4) ORDER BY surgery_date LIMIT ${TARGET_CASES}) x`,
  );
  const cohort = (to: string): CohortFilter => ({ from: '2023-01-01', to });
  const half = (await b.ds.query(`SELECT max(surgery_date)::text AS d FROM (SELECT surgery_date FROM analysis_case_facts WHERE surgery_date >= '2023-01-01' AND status IN (2, 3, 4) ORDER BY surgery_date LIMIT ${TARGET_CASES / 2}) x`))[0].d;

  const run = async (name: string, format: 'csv' | 'xlsx', to: string, target: string) => {
    const [req] = await b.ds.query(
      `INSERT INTO export_requests (requester_id, purpose, cohort, kind, fields, format, level, status, decided_by, decided_at, decision_reason, risk_action)
       VALUES ($1, 'benchmark', $2, 'rows', $3, $4, 'deidentified', 'approved', $5, now(), 'benchmark', 'none') RETURNING id`,
      [researcher.id, JSON.stringify(cohort(to)), fields, format, admin.id],
    );
    (globalThis as { gc?: () => void }).gc?.();
    const base = process.memoryUsage().rss;
    let peak = base;
    const timer = setInterval(() => { peak = Math.max(peak, process.memoryUsage().rss); }, 20);
    const t0 = performance.now();
    const result = await generateExport(context, req.id, { progress: async () => undefined, isCancelled: async () => false });
    const ms = performance.now() - t0;
    clearInterval(timer);
    peak = Math.max(peak, process.memoryUsage().rss);
    const [row] = await b.ds.query(`SELECT file_path FROM export_requests WHERE id = $1`, [req.id]);
    const bytes = statSync(row.file_path).size;
    const rows = Number(result.rows);
    b.record({ name, cohort: `${rows.toLocaleString('en')} cases x ${fields.length + 1} columns`, medianMs: Math.round(ms), p95Ms: Math.round(ms), bareSqlMs: null, ratio: null, peakRssMb: Math.round(peak / 1048576), explain: null, target, rssBeforeMb: Math.round(base / 1048576), fileMb: Math.round(bytes / 104857.6) / 10, cells: rows * (fields.length + 1) });
    b.log(`${name}: ${rows} rows in ${(ms / 1000).toFixed(1)} s, peak RSS ${Math.round(peak / 1048576)} MB (before ${Math.round(base / 1048576)} MB), file ${(bytes / 1048576).toFixed(1)} MB`);
    await b.ds.query(`DELETE FROM export_requests WHERE id = $1`, [req.id]);
    rmSync(row.file_path, { force: true });
  };

  try {
    await run('export csv (zip)', 'csv', d, '< 20 s, peak RSS < 250 MB');
    await run('export xlsx, half size', 'xlsx', half, 'RSS growth per cell');
    await run('export xlsx', 'xlsx', d, '< 60 s, peak RSS < 700 MB');
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}
