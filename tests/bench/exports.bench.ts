/**
 * Research export speed and memory (issue 8): 200,000 cases x 60 columns (study id + 59
 * variables, including the per-case outcome and therapy summaries), through the real generation
 * job (server/exports/generate.ts: server-side cursor, de-identification per row, streaming
 * writer). Targets: CSV < 20 s and peak RSS < 250 MB; xlsx < 60 s and peak RSS < 700 MB.
 *
 * Each export runs twice: in a process of its own (exports-worker.ts; peak RSS = the kernel's
 * maxRSS of that process, so no other work inflates it) and in the benchmark's in-process app
 * (its RSS includes the app and earlier runs: `rssBeforeMb`). Two sizes of each format show
 * whether memory grows with the export (it should not: rows stream from a cursor).
 */
import { execFileSync } from 'node:child_process';
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
  const appUrl = (b.ds.options as { url?: string }).url!;

  // Cohorts of about 200,000 and 100,000 counted cases: surgery from 2023-01-01 up to the day that reaches it.
  const upTo = async (n: number) => (await b.ds.query(`SELECT max(surgery_date)::text AS d FROM (SELECT surgery_date FROM analysis_case_facts WHERE surgery_date >= '2023-01-01' AND status IN (2, 3, 4) ORDER BY surgery_date LIMIT ${n}) x`))[0].d as string;
  const full = await upTo(TARGET_CASES);
  const half = await upTo(TARGET_CASES / 2);
  const cohort = (to: string): CohortFilter => ({ from: '2023-01-01', to });
  const newRequest = async (format: string, to: string) =>
    (await b.ds.query(
      `INSERT INTO export_requests (requester_id, purpose, cohort, kind, fields, format, level, status, decided_by, decided_at, decision_reason, risk_action)
       VALUES ($1, 'benchmark', $2, 'rows', $3, $4, 'deidentified', 'approved', $5, now(), 'benchmark', 'none') RETURNING id`,
      [researcher.id, JSON.stringify(cohort(to)), fields, format, admin.id],
    ))[0].id as string;
  const cleanUp = async (id: string) => {
    const [row] = await b.ds.query(`DELETE FROM export_requests WHERE id = $1 RETURNING file_path`, [id]);
    if (row?.file_path) rmSync(row.file_path, { force: true });
  };

  const own = async (name: string, format: 'csv' | 'xlsx', to: string, target: string) => {
    const id = await newRequest(format, to);
    const out = execFileSync(process.execPath, ['--import', 'tsx', join(import.meta.dirname, 'exports-worker.ts'), id], { env: { ...process.env, DATABASE_URL: appUrl, EXPORT_BENCH_DIR: dataDir }, encoding: 'utf8' });
    const r = JSON.parse(out.trim().split('\n').pop()!);
    b.record({ name: `${name} (own process)`, cohort: `${r.rows.toLocaleString('en')} cases x ${fields.length + 1} columns`, medianMs: r.ms, p95Ms: r.ms, bareSqlMs: null, ratio: null, peakRssMb: r.maxRssMb, explain: null, target, rssBeforeMb: r.rssBeforeMb, fileMb: Math.round(r.bytes / 104857.6) / 10, cells: r.rows * (fields.length + 1) });
    b.log(`${name} (own process): ${r.rows} rows in ${(r.ms / 1000).toFixed(1)} s, maxRSS ${r.maxRssMb} MB (process at ${r.rssBeforeMb} MB when the export started), file ${(r.bytes / 1048576).toFixed(1)} MB`);
    await cleanUp(id);
  };

  const inApp = async (name: string, format: 'csv' | 'xlsx', to: string, target: string) => {
    const id = await newRequest(format, to);
    const base = process.memoryUsage().rss;
    let peak = base;
    const timer = setInterval(() => { peak = Math.max(peak, process.memoryUsage().rss); }, 20);
    const t0 = performance.now();
    const result = await generateExport(context, id, { progress: async () => undefined, isCancelled: async () => false });
    const ms = performance.now() - t0;
    clearInterval(timer);
    peak = Math.max(peak, process.memoryUsage().rss);
    const [row] = await b.ds.query(`SELECT file_path FROM export_requests WHERE id = $1`, [id]);
    const bytes = statSync(row.file_path).size;
    const rows = Number(result.rows);
    b.record({ name: `${name} (in the app)`, cohort: `${rows.toLocaleString('en')} cases x ${fields.length + 1} columns`, medianMs: Math.round(ms), p95Ms: Math.round(ms), bareSqlMs: null, ratio: null, peakRssMb: Math.round(peak / 1048576), explain: null, target, rssBeforeMb: Math.round(base / 1048576), fileMb: Math.round(bytes / 104857.6) / 10, cells: rows * (fields.length + 1) });
    b.log(`${name} (in the app): ${rows} rows in ${(ms / 1000).toFixed(1)} s, peak RSS ${Math.round(peak / 1048576)} MB (before ${Math.round(base / 1048576)} MB)`);
    await cleanUp(id);
  };

  try {
    await own('export csv, half size', 'csv', half, 'RSS independent of size');
    await own('export csv', 'csv', full, '< 20 s, peak RSS < 250 MB');
    await own('export xlsx, half size', 'xlsx', half, 'RSS growth per cell');
    await own('export xlsx', 'xlsx', full, '< 60 s, peak RSS < 700 MB');
    await inApp('export csv', 'csv', full, '< 20 s, peak RSS < 250 MB');
    await inApp('export xlsx', 'xlsx', full, '< 60 s, peak RSS < 700 MB');
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}
