/**
 * The benchmark harness (`npm run bench` runs `node --import tsx tests/bench/harness.ts FILE` for
 * each tests/bench/*.bench.ts, in order). It
 * - creates (or reuses) the scratch database `alveolog_bench` on the TEST cluster (port 54329),
 *   migrated and demo-seeded, with 1,000,000 synthetic cases loaded by COPY (load-registry.ts);
 *   reused while the migrations, the seed and the loader are unchanged;
 * - builds the app in-process, listening on a loopback port, signed in per demo role;
 * - `time(name, cohort, fn, { bareSql })`: warm median and p95 over N runs, the bare SQL's median
 *   over the same runs, their ratio, peak RSS and the EXPLAIN ANALYZE of the bare SQL;
 * - appends the rows to tests/bench/results.json and prints them as a table.
 *
 * A bench file: `export default async (b: Bench) => { await b.time(...) }`.
 */
import { createHash } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import pg from 'pg';
import { pathToFileURL } from 'node:url';
// @ts-expect-error plain ESM module without types
import { cluster, ensureDatabase, dbEnv, ROOT } from '../../server/bootstrap/lib.mjs';
import { TEST_ENV, TEST_PG_PORT } from '../setup/test-cluster.js';
import { loadConfig } from '../../server/config.js';
import { createDataSource } from '../../server/db/create-data-source.js';
import { createApp } from '../../server/app.js';
import { createMailer } from '../../server/mail/mailer.js';
import type { AppContext } from '../../server/context.js';
import type { DataSource } from 'typeorm';
import { DEMO_PASSWORD } from '../../server/db/seed/scenario.js';
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { loadRegistry } from './load-registry.js';
import { keptAliveClient, type HttpClient } from './http-client.js';

export const BENCH_DB = 'alveolog_bench';
export const BENCH_CASES = Number(process.env.BENCH_CASES ?? 1_000_000);
export const RESULTS_FILE = path.join(ROOT as string, 'tests/bench/results.json');

export interface SqlQuery { text: string; values?: unknown[] }

export interface ResultRow {
  name: string;
  cohort: string;
  medianMs: number;
  p95Ms: number;
  bareSqlMs: number | null;
  ratio: number | null;
  peakRssMb: number;
  explain: string | null;
  target?: string;
  [extra: string]: unknown;
}

export interface TimeOptions {
  /** The SQL aggregate(s) the route rests on; an array runs concurrently, as the service does. */
  bareSql?: SqlQuery | SqlQuery[];
  runs?: number;
  warmup?: number;
  /** Printed beside the figure, e.g. "< 150 ms, ratio < 1.5". */
  target?: string;
}

export type { HttpClient };

export interface Bench {
  /** App-role DataSource of the benchmark database (the app's own). */
  ds: DataSource;
  /** Superuser pool on the benchmark database (for EXPLAIN and bare SQL). */
  pool: pg.Pool;
  baseUrl: string;
  /** A signed-in client per demo key (admin, abstractor, analyst, chair, committee, researcher). */
  as(key: string): Promise<HttpClient>;
  sites: Record<string, string>;
  /** The named cohorts of issue 4. */
  cohorts: Record<'network-5y' | 'site-2y' | 'upper-abdominal-int-high', CohortFilter>;
  time(name: string, cohort: string, fn: () => Promise<unknown>, opts?: TimeOptions): Promise<ResultRow>;
  record(row: ResultRow): void;
  log(msg: string): void;
}

const log = (m: string) => process.stdout.write(`[bench] ${m}\n`);

export function inputsHash(): string {
  const h = createHash('sha256');
  h.update(String(BENCH_CASES));
  const walk = (file: string) => { if (fs.existsSync(file)) h.update(fs.readFileSync(file)); };
  // The loaded data depend on the analysis tables' migration and the loader; other migrations
  // (new ones, edited views) are applied to the reused database: setup.ts migrates, the seed is skipped.
  for (const f of fs.readdirSync(path.join(ROOT, 'server/db/migrations')).filter((n) => /-AnalysisCohorts\.ts$/.test(n)).sort()) h.update(fs.readFileSync(path.join(ROOT, 'server/db/migrations', f)));
  walk(path.join(ROOT, 'tests/bench/load-registry.ts'));
  return h.digest('hex').slice(0, 16);
}

/** Creates, migrates, seeds and loads the benchmark database unless an identical one exists. */
export async function prepareDatabase(): Promise<Record<string, string>> {
  const c = cluster({ name: 'test', port: TEST_PG_PORT, fast: true });
  c.start();
  const hash = inputsHash();
  const superAdmin = dbEnv(c, 'postgres', ensureDatabase(c, 'alveolog_template')).DATABASE_SUPER_URL as string;
  const admin = new pg.Client({ connectionString: superAdmin });
  await admin.connect();
  try {
    const { rows } = await admin.query(`SELECT shobj_description(oid, 'pg_database') AS d FROM pg_database WHERE datname = $1`, [BENCH_DB]);
    if (rows[0]?.d === hash) {
      log(`reusing ${BENCH_DB} (${BENCH_CASES.toLocaleString('en')} cases, inputs ${hash}); applying any newer migrations`);
      const env = dbEnv(c, BENCH_DB, ensureDatabase(c, BENCH_DB)) as Record<string, string>;
      execFileSync(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server/db/setup.ts')], { cwd: ROOT, stdio: 'inherit', env: { ...process.env, ...env, ...TEST_ENV, SEED_DEMO: 'false' } });
    } else {
      log(`building ${BENCH_DB}: migrate, demo seed, ${BENCH_CASES.toLocaleString('en')} synthetic cases ...`);
      await admin.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
      const roles = ensureDatabase(c, BENCH_DB);
      const env = dbEnv(c, BENCH_DB, roles) as Record<string, string>;
      execFileSync(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server/db/setup.ts')], { cwd: ROOT, stdio: 'inherit', env: { ...process.env, ...env, ...TEST_ENV, SEED_DEMO: 'true' } });
      const r = await loadRegistry(superUrlFor(env), { cases: BENCH_CASES, log });
      log(`loaded in ${r.seconds.toFixed(0)} s: ${r.cases.toLocaleString('en')} cases, ${r.events.toLocaleString('en')} events, ${r.episodes.toLocaleString('en')} episodes`);
      await admin.query(`COMMENT ON DATABASE ${BENCH_DB} IS '${hash}'`);
    }
  } finally {
    await admin.end();
  }
  const roles = ensureDatabase(c, BENCH_DB);
  return { ...(dbEnv(c, BENCH_DB, roles) as Record<string, string>), ...TEST_ENV };
}

function superUrlFor(env: Record<string, string>): string {
  const u = new URL(env.DATABASE_SUPER_URL);
  u.pathname = `/${BENCH_DB}`;
  // The bare SQL goes over the same transport as the application's queries (its Unix socket).
  const socket = new URL(env.DATABASE_URL).searchParams.get('host');
  if (socket) u.searchParams.set('host', socket);
  return u.toString();
}

async function signedInClient(baseUrl: string, email: string): Promise<HttpClient> {
  let cookie = '';
  const keep = (res: Response) => {
    const set = res.headers.getSetCookie?.() ?? [];
    for (const s of set) {
      const [pair] = s.split(';');
      const name = pair.split('=')[0];
      const rest = cookie.split('; ').filter((c) => c && !c.startsWith(`${name}=`));
      cookie = [...rest, pair].join('; ');
    }
  };
  const r1 = await fetch(`${baseUrl}/api/auth/csrf`);
  keep(r1);
  const { csrfToken } = (await r1.json()) as { csrfToken: string };
  const r2 = await fetch(`${baseUrl}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  keep(r2);
  if (r2.status !== 200) throw new Error(`bench sign-in as ${email} failed: ${r2.status} ${await r2.text()}`);
  return keptAliveClient(baseUrl, { cookie });
}


const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); const m = Math.floor(s.length / 2); return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2; };
const p95 = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[Math.min(s.length - 1, Math.ceil(0.95 * s.length) - 1)]; };
const round = (x: number) => Math.round(x * 10) / 10;

export async function createBench(): Promise<{ bench: Bench; rows: ResultRow[]; close: () => Promise<void> }> {
  const env = await prepareDatabase();
  const config = loadConfig({ ...env, SMTP_STANDIN: 'true', LOG_LEVEL: 'warn' } as NodeJS.ProcessEnv);
  const ds = await createDataSource(config.DATABASE_URL, 10).initialize();
  const context: AppContext = { ds, readDs: ds, config, mailer: createMailer(config) };
  const app = createApp(context, {});
  const server = app.listen(0, '127.0.0.1');
  await new Promise<void>((res) => server.once('listening', () => res()));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const pool = new pg.Pool({ connectionString: superUrlFor(env), max: 4 });
  const siteRows = (await ds.query(`SELECT id::text AS id, code FROM sites`)) as { id: string; code: string }[];
  const sites = Object.fromEntries(siteRows.map((s) => [s.code, s.id]));
  const clients = new Map<string, HttpClient>();
  const rows: ResultRow[] = [];
  let peakRss = 0;
  const sampleRss = () => { peakRss = Math.max(peakRss, process.memoryUsage.rss()); };
  // Also sampled around every timed run; reading /proc costs ~0.2 ms here, so not too often.
  const rssTimer = setInterval(sampleRss, 100);

  const runSql = async (q: SqlQuery | SqlQuery[]) => {
    const list = Array.isArray(q) ? q : [q];
    await Promise.all(list.map((x) => pool.query(x.text, x.values ?? [])));
  };

  const bench: Bench = {
    ds, pool, baseUrl, sites,
    cohorts: {
      'network-5y': { from: '2021-01-01', to: '2025-12-31' },
      'site-2y': { from: '2024-01-01', to: '2025-12-31', sites: [sites.HBR] },
      'upper-abdominal-int-high': { from: '2021-01-01', to: '2025-12-31', ariscatClasses: ['intermediate', 'high'], incisionSites: ['upper-abdominal', 'upper-and-lower-abdominal'] },
    },
    async as(key) {
      const c = clients.get(key) ?? (await signedInClient(baseUrl, `${key}@tidewater.example`));
      clients.set(key, c);
      return c;
    },
    async time(name, cohort, fn, opts = {}) {
      const runs = opts.runs ?? 25;
      const warmup = opts.warmup ?? 10;
      for (let i = 0; i < warmup; i++) { await fn(); if (opts.bareSql) await runSql(opts.bareSql); }
      const appMs: number[] = [];
      const sqlMs: number[] = [];
      // Interleaved, so that both see the same cache and load.
      for (let i = 0; i < runs; i++) {
        sampleRss();
        let t = performance.now();
        await fn();
        appMs.push(performance.now() - t);
        if (opts.bareSql) {
          t = performance.now();
          await runSql(opts.bareSql);
          sqlMs.push(performance.now() - t);
        }
      }
      sampleRss();
      let explain: string | null = null;
      if (opts.bareSql) {
        const list = Array.isArray(opts.bareSql) ? opts.bareSql : [opts.bareSql];
        const parts: string[] = [];
        for (const q of list) {
          const r = await pool.query(`EXPLAIN (ANALYZE, BUFFERS) ${q.text}`, q.values ?? []);
          parts.push(r.rows.map((x: Record<string, string>) => x['QUERY PLAN']).join('\n'));
        }
        explain = parts.join('\n---\n');
      }
      const bare = sqlMs.length ? median(sqlMs) : null;
      const row: ResultRow = {
        name, cohort, medianMs: round(median(appMs)), p95Ms: round(p95(appMs)),
        bareSqlMs: bare == null ? null : round(bare), ratio: bare == null ? null : Math.round((median(appMs) / bare) * 100) / 100,
        peakRssMb: Math.round(peakRss / 1048576), explain, ...(opts.target ? { target: opts.target } : {}),
      };
      rows.push(row);
      log(`${name} [${cohort}]: median ${row.medianMs} ms, p95 ${row.p95Ms} ms, bare SQL ${row.bareSqlMs ?? '-'} ms, ratio ${row.ratio ?? '-'}${opts.target ? ` (target ${opts.target})` : ''}`);
      return row;
    },
    record(row) { rows.push(row); },
    log,
  };
  return {
    bench,
    rows,
    async close() {
      clearInterval(rssTimer);
      await pool.end();
      await new Promise<void>((res) => server.close(() => res()));
      await ds.destroy();
    },
  };
}

/** Appends this file's rows to results.json (rows of the same name and cohort are replaced). */
export function writeResults(rows: ResultRow[]): ResultRow[] {
  const old: ResultRow[] = fs.existsSync(RESULTS_FILE) ? JSON.parse(fs.readFileSync(RESULTS_FILE, 'utf8')) : [];
  const keyOf = (r: ResultRow) => `${r.name}|${r.cohort}`;
  const fresh = new Set(rows.map(keyOf));
  const all = [...old.filter((r) => !fresh.has(keyOf(r))), ...rows];
  fs.writeFileSync(RESULTS_FILE, JSON.stringify(all, null, 2) + '\n');
  return all;
}

export function printTable(rows: ResultRow[]): void {
  const head = ['name', 'cohort', 'median ms', 'p95 ms', 'bare SQL ms', 'ratio', 'peak RSS MB', 'target'];
  const body = rows.map((r) => [r.name, r.cohort, String(r.medianMs), String(r.p95Ms), r.bareSqlMs == null ? '-' : String(r.bareSqlMs), r.ratio == null ? '-' : String(r.ratio), String(r.peakRssMb), r.target ?? '']);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i < 2 || i === 7 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');
  process.stdout.write(`${line(head)}\n${widths.map((w) => '-'.repeat(w)).join('  ')}\n${body.map(line).join('\n')}\n`);
}

// Entry point: node --import tsx tests/bench/harness.ts tests/bench/<name>.bench.ts
if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const file = process.argv[2];
  if (!file) { console.error('usage: node --import tsx tests/bench/harness.ts tests/bench/<name>.bench.ts'); process.exit(2); }
  const mod = (await import(pathToFileURL(path.resolve(file)).href)) as { default: (b: Bench) => Promise<void> };
  const { bench, rows, close } = await createBench();
  let failed = false;
  try {
    await mod.default(bench);
  } catch (e) {
    failed = true;
    console.error(`[bench] ${path.basename(file)} failed: ${(e as Error).stack ?? e}`);
  } finally {
    await close();
  }
  writeResults(rows);
  printTable(rows);
  process.exit(failed ? 1 : 0);
}
