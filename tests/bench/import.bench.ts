/**
 * Bulk import speed and memory (issue 5): a 50,000-case xlsx (every case column of the import
 * template, hospital identifiers included) through the real upload scan, dry-run job and commit
 * job, on the 1,000,000-case benchmark database. Targets: dry run < 30 s, commit < 30 s, peak RSS
 * of the server process (this process: the app runs in-process) < 600 MB. The imported cases are
 * removed afterwards so the other benchmarks keep their 1,000,000 cases.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { execFileSync } from 'node:child_process';
import type { Bench } from './harness.js';
import { loadConfig } from '../../server/config.js';
import type { AppContext } from '../../server/context.js';
import { runOne } from '../../server/jobs/jobs.service.js';
import { createImport, startCommit, startDryRun } from '../../server/imports/imports.service.js';
import '../../server/imports/imports.jobs.js';
import { CASE_COLUMNS } from '../../shared/imports/fields.js';
import type { SessionUser } from '../../shared/auth/user.js';

const CASES = Number(process.env.BENCH_IMPORT_CASES ?? 50_000);

export default async function importBench(b: Bench): Promise<void> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-import-bench-'));
  const config = loadConfig({ DATABASE_URL: 'postgres://unused', SESSION_SECRET: 's'.repeat(40), IDENTIFIER_HASH_SECRET: 'h'.repeat(40), DATA_DIR: dataDir, IMPORT_MAX_ROWS: '100000' } as NodeJS.ProcessEnv);
  const context: AppContext = { ds: b.ds, readDs: b.ds, config, mailer: { send: async () => undefined, close: () => undefined } as never };
  const [admin] = await b.ds.query(`SELECT id, email FROM users WHERE 'admin' = ANY(roles) LIMIT 1`);
  const siteIds = (await b.ds.query(`SELECT id FROM sites`)).map((s: { id: string }) => s.id);
  const user: SessionUser = { id: admin.id, email: admin.email, displayName: 'bench', roles: ['admin'], isChair: false, siteIds, totpEnabled: true, mustEnrollTotp: false } as SessionUser;
  const actor = { user, ip: null };
  const file = path.join(dataDir, 'bench-50k.xlsx');
  const tGen = performance.now();
  execFileSync(process.execPath, ['--import', 'tsx', path.resolve('tests/bench/import-workbook.ts'), file, String(CASES)], { stdio: 'inherit' });
  b.log(`generated ${CASES} cases in ${((performance.now() - tGen) / 1000).toFixed(1)} s (${(fs.statSync(file).size / 1048576).toFixed(1)} MB)`);

  const measure = async (name: string, target: string, fn: () => Promise<unknown>) => {
    (globalThis as { gc?: () => void }).gc?.();
    const base = process.memoryUsage().rss;
    let peak = base;
    const timer = setInterval(() => { peak = Math.max(peak, process.memoryUsage().rss); }, 20);
    const t0 = performance.now();
    await fn();
    const ms = performance.now() - t0;
    clearInterval(timer);
    peak = Math.max(peak, process.memoryUsage().rss);
    b.record({ name, cohort: `${CASES.toLocaleString('en')} cases (xlsx, ${CASE_COLUMNS.length - 1} columns)`, medianMs: Math.round(ms), p95Ms: Math.round(ms), bareSqlMs: null, ratio: null, peakRssMb: Math.round(peak / 1048576), explain: null, target, rssBeforeMb: Math.round(base / 1048576) });
    b.log(`${name}: ${(ms / 1000).toFixed(1)} s, peak RSS ${Math.round(peak / 1048576)} MB (before ${Math.round(base / 1048576)} MB)`);
  };

  let importId = '';
  try {
    // The upload (scan: headers, row count, mapping proposal) on a copy, as multer would leave it.
    const upload = path.join(dataDir, 'upload-copy');
    fs.copyFileSync(file, upload);
    await measure('import upload scan', 'informative', async () => {
      const v = await createImport(context, { path: upload, originalname: 'bench-50k.xlsx', size: fs.statSync(upload).size }, { siteId: siteIds[0], decimal: 'point', kind: 'cases' }, actor);
      importId = v.id;
    });
    const [row] = await b.ds.query(`SELECT sheets FROM import_jobs WHERE id = $1`, [importId]);
    const mapping = Object.fromEntries(row.sheets.map((s: { kind: string; proposed: unknown }) => [s.kind, s.proposed]));
    await measure('import dry run (job)', '< 30 s, peak RSS < 600 MB', async () => {
      await startDryRun(context, importId, { mapping }, actor);
      await runOne(context);
    });
    const [after] = await b.ds.query(`SELECT status, counts FROM import_jobs WHERE id = $1`, [importId]);
    if (after.status !== 'validated' || after.counts.rejected) throw new Error(`dry run did not validate cleanly: ${JSON.stringify(after.counts)}`);
    b.log(`dry run counts: ${JSON.stringify({ new: after.counts.new, rejected: after.counts.rejected, warnings: after.counts.warnings })}`);
    await measure('import commit (job, one transaction)', '< 30 s, peak RSS < 600 MB', async () => {
      await startCommit(context, importId, { existing: 'skip' }, actor);
      await runOne(context);
    });
    const [done] = await b.ds.query(`SELECT status, counts FROM import_jobs WHERE id = $1`, [importId]);
    if (done.status !== 'committed') throw new Error(`commit did not finish: ${done.status}`);
    b.log(`committed: ${done.counts.written} cases written`);
  } finally {
    if (importId) {
      // Keep the benchmark database at its 1,000,000 cases for the other benchmarks.
      await b.pool.query(`DELETE FROM surgical_cases WHERE id::text IN (SELECT entity_id FROM audit_entries WHERE action = 'case-created' AND details->>'importId' = $1)`, [importId]);
      await b.pool.query(`DELETE FROM import_jobs WHERE id = $1`, [importId]);
      // And without the dead rows: left to autovacuum (20% of a million rows) they slowed each
      // later run's unique checks and index inserts (a second run's commit took 57 s, not 45).
      await b.pool.query(`VACUUM (ANALYZE) surgical_cases, analysis_case_facts, analysis_cells, analysis_los_cells, therapy_episodes, outcome_events`);
    }
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}
