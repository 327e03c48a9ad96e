// `npm run bench`: installs what is missing, starts the test cluster, then runs each
// tests/bench/*.bench.ts in order through the harness (tests/bench/harness.ts), which builds or
// reuses the 1,000,000-case database and writes tests/bench/results.json.
// Node built-ins only until ensureNodeModules() has run.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { ROOT, log, ensureNodeModules, cluster, SERVER_NODE_FLAGS } from './lib.mjs';

ensureNodeModules();
const pg = cluster({ name: 'test', port: Number(process.env.ALVEOLOG_TEST_PG_PORT ?? 54329), fast: true });
pg.start();

const dir = path.join(ROOT, 'tests', 'bench');
const only = process.argv.slice(2);
const files = fs.readdirSync(dir).filter((f) => f.endsWith('.bench.ts')).sort()
  .filter((f) => !only.length || only.some((o) => f.includes(o)));
if (!only.length) fs.rmSync(path.join(dir, 'results.json'), { force: true });
let failed = 0;
for (const f of files) {
  log(`bench: ${f}`);
  const t = Date.now();
  // The app runs inside the harness, so the harness gets the server's V8 flags; NODE_OPTIONS
  // passes them on to the processes it starts (the export worker).
  const env = { ...process.env, NODE_OPTIONS: [process.env.NODE_OPTIONS, ...SERVER_NODE_FLAGS].filter(Boolean).join(' ') };
  const r = spawnSync(process.execPath, ['--import', 'tsx', path.join(dir, 'harness.ts'), path.join(dir, f)], { cwd: ROOT, stdio: 'inherit', env });
  log(`${r.status === 0 ? 'done' : 'FAILED'}: ${f} (${((Date.now() - t) / 1000).toFixed(1)} s)`);
  if (r.status !== 0) failed++;
}
log(`results: ${path.relative(ROOT, path.join(dir, 'results.json'))}`);
process.exit(failed ? 1 : 0);
