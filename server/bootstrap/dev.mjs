// `npm run dev`: the API server (tsx watch) plus Vite's dev server with hot reload, proxying /api.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { ROOT, log, runTs, SERVER_NODE_FLAGS } from './lib.mjs';
import { prepareMain } from './main-env.mjs';

const { pg, env, startedHere, port } = prepareMain();
runTs('server/db/setup.ts', env);
const api = spawn(process.execPath, [...SERVER_NODE_FLAGS, '--import', 'tsx', '--watch', path.join(ROOT, 'server/main.ts')], { cwd: ROOT, env: { ...process.env, ...env, NODE_ENV: 'development' }, stdio: 'inherit' });
const vite = spawn(process.execPath, [path.join(ROOT, 'node_modules/vite/bin/vite.js'), '--port', String(port + 1173), '--strictPort'], { cwd: ROOT, env: { ...process.env, API_PORT: String(port) }, stdio: 'inherit' });
log(`dev: API on http://127.0.0.1:${port}, client with hot reload on http://127.0.0.1:${port + 1173}`);
const stop = () => { api.kill('SIGTERM'); vite.kill('SIGTERM'); setTimeout(() => { if (startedHere) pg.stop(); process.exit(0); }, 1500); };
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
