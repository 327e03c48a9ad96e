/** A real server process (node --import tsx server/main.ts) on this test file's database. */
import { testDbEnv } from '../../setup/db-env.js';
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import request from 'supertest';
import { Client, demoEmail, type DemoKey } from '../helpers.js';

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

export interface ServerProcess { child: ChildProcess; url: string; as(key: DemoKey): Promise<Client>; stop(): Promise<void> }

/** Starts the server and waits for its 'ready' message (sent once it listens). */
export async function startServerProcess(env: Record<string, string>): Promise<ServerProcess> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: process.cwd(),
    env: { ...process.env, ...testDbEnv(), PORT: String(port), SMTP_STANDIN: 'false', ...env },
    stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
  });
  let output = '';
  child.stdout?.on('data', (d) => { output += String(d); });
  child.stderr?.on('data', (d) => { output += String(d); });
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start in 60 s:\n${output}`)), 60_000);
    child.on('message', (m) => { if (m === 'ready') { clearTimeout(timer); resolve(); } });
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`server exited with ${code}:\n${output}`)); });
  });
  const url = `http://127.0.0.1:${port}`;
  return {
    child, url,
    async as(key) {
      const c = new Client(request.agent(url));
      const r = await c.signIn(demoEmail(key));
      if (r.status !== 200) throw new Error(`sign-in as ${key} failed: ${r.status}`);
      return c;
    },
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await exited;
    },
  };
}

export async function waitFor<T>(what: string, fn: () => Promise<T | null | undefined | false>, timeoutMs = 60_000, everyMs = 100): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v as T;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
