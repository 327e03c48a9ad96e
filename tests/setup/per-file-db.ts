/**
 * Each test file gets its own database, cloned from the seeded template before its hooks run and
 * dropped after, so no file sees rows another file wrote (files run in any order).
 */
import { afterAll, beforeAll, inject } from 'vitest';
import pg from 'pg';
import { setTestDbEnv } from './db-env.js';

let name: string | null = null;
let superUrl = '';

beforeAll(async () => {
  const base = inject('testDbEnv');
  superUrl = base.DATABASE_SUPER_URL;
  const owner = decodeURIComponent(new URL(base.DATABASE_OWNER_URL).username);
  const app = decodeURIComponent(new URL(base.DATABASE_URL).username);
  name = `${new URL(base.DATABASE_URL).pathname.slice(1)}_f${Math.random().toString(36).slice(2, 8)}`;
  const c = new pg.Client({ connectionString: superUrl });
  await c.connect();
  try {
    // The template is rebuilt under this advisory lock (tests/setup/test-cluster.ts).
    await c.query('SELECT pg_advisory_lock(424242)');
    await c.query(`CREATE DATABASE ${name} TEMPLATE alveolog_template OWNER ${owner}`);
    await c.query(`GRANT CONNECT ON DATABASE ${name} TO ${app}`);
    await c.query('SELECT pg_advisory_unlock(424242)');
  } finally {
    await c.end();
  }
  const swap = (url: string) => url.replace(/\/[^/?]+(\?|$)/, `/${name}$1`);
  setTestDbEnv({ ...base, DATABASE_URL: swap(base.DATABASE_URL), DATABASE_OWNER_URL: swap(base.DATABASE_OWNER_URL) });
}, 120_000);

afterAll(async () => {
  if (!name || process.env.KEEP_TEST_DB) return;
  const c = new pg.Client({ connectionString: superUrl });
  await c.connect();
  try {
    await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  } finally {
    await c.end();
  }
});
