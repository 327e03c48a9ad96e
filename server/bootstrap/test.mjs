// `npm test`: bootstraps the test cluster and chromium, then runs every stage and prints its time.
// Node built-ins only until ensureNodeModules() has run.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ROOT, log, ensureNodeModules, ensureChromium, ensureLibreOffice, cluster, ensureDatabase, buildClient } from './lib.mjs';

const timings = [];
function stage(name, fn) {
  const t = Date.now();
  let ok = true;
  try {
    ok = fn() !== false;
  } catch (err) {
    process.stderr.write(`[alveolog] ${name}: ${err.message}\n`);
    ok = false;
  }
  timings.push({ name, seconds: (Date.now() - t) / 1000, ok });
  log(`${ok ? 'passed' : 'FAILED'}: ${name} (${((Date.now() - t) / 1000).toFixed(1)} s)`);
  return ok;
}

function node(args, env = {}) {
  const r = spawnSync(process.execPath, args, { cwd: ROOT, stdio: 'inherit', env: { ...process.env, ...env } });
  return r.status === 0;
}
const bin = (pkg, file) => path.join(ROOT, 'node_modules', pkg, file);

const t0 = Date.now();
stage('install (npm dependencies, PostgreSQL, chromium, LibreOffice)', () => {
  ensureNodeModules();
  ensureChromium();
  ensureLibreOffice();
  const pg = cluster({ name: 'test', port: Number(process.env.ALVEOLOG_TEST_PG_PORT ?? 54329), fast: true });
  pg.start();
  ensureDatabase(pg, 'alveolog_template');
});
const results = [
  stage('lint (ESLint with import boundaries)', () => node([bin('eslint', 'bin/eslint.js'), '.', '--max-warnings=0'])),
  stage('type check (tsc --noEmit)', () => node([bin('typescript', 'bin/tsc'), '--noEmit', '-p', 'tsconfig.json'])),
  stage('migrations match the entities', () => node(['--import', 'tsx', 'tests/setup/check-migrations.ts'])),
  stage('unit tests (analysis, shared)', () => node([bin('vitest', 'vitest.mjs'), 'run', '--project', 'unit'])),
  stage('API integration tests (real PostgreSQL)', () => node([bin('vitest', 'vitest.mjs'), 'run', '--project', 'api'])),
  stage('client build', () => { buildClient(); }),
  stage('browser tests (chromium)', () => node([bin('vitest', 'vitest.mjs'), 'run', '--project', 'browser'])),
];
const passed = results.filter(Boolean).length;
log('stage timings:');
for (const t of timings) log(`  ${t.ok ? 'ok  ' : 'FAIL'} ${t.seconds.toFixed(1).padStart(7)} s  ${t.name}`);
log(`total ${((Date.now() - t0) / 1000).toFixed(1)} s`);
console.log(`stages: ${passed} passed, ${results.length - passed} failed`);
process.exit(results.every(Boolean) && timings[0].ok ? 0 : 1);
