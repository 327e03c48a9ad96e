// `npm run load`: a bounded mixed read/write load on loopback against the demo data (autocannon).
import { spawn } from 'node:child_process';
import path from 'node:path';
import { ROOT, fail, runTs, clientIsStale, buildClient, SERVER_NODE_FLAGS } from './lib.mjs';
import { prepareMain } from './main-env.mjs';

const { pg, env, startedHere } = prepareMain();
const port = Number(process.env.LOAD_PORT ?? 3990);
const serverEnv = { ...env, PORT: String(port), APP_URL: `http://127.0.0.1:${port}`, LOGIN_RATE_LIMIT: '100000', LOG_LEVEL: 'warn', SMTP_PORT: String(port + 2000) };
runTs('server/db/setup.ts', serverEnv);
if (clientIsStale()) buildClient();
// LOAD_CPU_PROFILE=DIR writes a V8 CPU profile of the server (open it in Chrome's DevTools).
const profile = process.env.LOAD_CPU_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${path.resolve(process.env.LOAD_CPU_PROFILE)}`] : [];
const server = spawn(process.execPath, [...SERVER_NODE_FLAGS, ...profile, '--import', 'tsx', path.join(ROOT, 'server/main.ts')], { cwd: ROOT, env: { ...process.env, ...serverEnv }, stdio: 'inherit' });
const stop = (code) => { server.kill('SIGTERM'); setTimeout(() => { if (startedHere) pg.stop(); process.exit(code); }, 1500); };
try {
  for (let i = 0; i < 120; i++) {
    try { if ((await fetch(`http://127.0.0.1:${port}/api/health`)).ok) break; } catch { /* starting */ }
    await new Promise((r) => setTimeout(r, 500));
  }
  const r = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'tests/load/load.ts')], { cwd: ROOT, env: { ...process.env, LOAD_URL: `http://127.0.0.1:${port}`, BCRYPT_COST: process.env.BCRYPT_COST ?? '12' }, stdio: 'inherit' });
  r.on('exit', (code) => stop(code ?? 1));
} catch (e) {
  fail(e.message);
  stop(1);
}
