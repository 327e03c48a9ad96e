import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
// The bootstrap helpers use Node built-ins only, so tests share them with `npm test`.
// @ts-expect-error plain ESM module without types
import { cluster, ensureDatabase, dbEnv, ROOT } from '../../server/bootstrap/lib.mjs';

export const TEST_PG_PORT = Number(process.env.ALVEOLOG_TEST_PG_PORT ?? 54329);
export const TEMPLATE_DB = 'alveolog_template';

/** Fixed secrets for the throwaway test cluster only. */
export const TEST_ENV = {
  NODE_ENV: 'test',
  SESSION_SECRET: 'test-session-secret-0123456789abcdef0123456789',
  IDENTIFIER_HASH_SECRET: 'test-identifier-secret-0123456789abcdef01234567',
  BCRYPT_COST: '4',
  DEMO_MODE: 'true',
  LOGIN_RATE_LIMIT: '10000',
};

export interface TestDb { name: string; env: Record<string, string> }

function templateHash(): string {
  const h = createHash('sha256');
  const walk = (dir: string) => {
    if (!fs.existsSync(dir)) return;
    for (const e of fs.readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else { h.update(p); h.update(fs.readFileSync(p)); }
    }
  };
  for (const d of ['server/db/migrations', 'server/db/seed', 'server/db/entities']) walk(path.join(ROOT, d));
  return h.digest('hex').slice(0, 16);
}

async function withLock<T>(superUrl: string, fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: superUrl });
  await client.connect();
  try {
    await client.query('SELECT pg_advisory_lock(424242)');
    return await fn(client);
  } finally {
    await client.query('SELECT pg_advisory_unlock(424242)').catch(() => undefined);
    await client.end();
  }
}

/**
 * Starts the test cluster if needed, (re)builds the template database when migrations or the
 * seed changed (migrated and seeded once), and clones a fresh database for this run from it.
 */
export async function createTestDatabase(label: string): Promise<TestDb> {
  const c = cluster({ name: 'test', port: TEST_PG_PORT, fast: true });
  c.start();
  const roles = ensureDatabase(c, TEMPLATE_DB);
  const base = dbEnv(c, TEMPLATE_DB, roles) as Record<string, string>;
  const hash = templateHash();
  const name = `alveolog_${label}_${process.pid}_${Date.now().toString(36)}`;
  await withLock(base.DATABASE_SUPER_URL, async (client) => {
    const { rows } = await client.query(`SELECT shobj_description(oid, 'pg_database') AS d FROM pg_database WHERE datname = $1`, [TEMPLATE_DB]);
    if (rows[0]?.d !== hash) {
      await client.query(`DROP DATABASE IF EXISTS ${TEMPLATE_DB} WITH (FORCE)`);
      await client.query(`CREATE DATABASE ${TEMPLATE_DB} OWNER ${roles.owner}`);
      await client.query(`GRANT CONNECT ON DATABASE ${TEMPLATE_DB} TO ${roles.app}`);
      const { execFileSync } = await import('node:child_process');
      execFileSync(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server/db/setup.ts')], {
        cwd: ROOT, stdio: 'inherit', env: { ...process.env, ...base, ...TEST_ENV, SEED_DEMO: 'true' },
      });
      await client.query(`COMMENT ON DATABASE ${TEMPLATE_DB} IS '${hash}'`);
    }
    await client.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE_DB} OWNER ${roles.owner}`);
    await client.query(`GRANT CONNECT ON DATABASE ${name} TO ${roles.app}`);
  });
  const env = dbEnv(c, name, roles) as Record<string, string>;
  return { name, env: { ...env, ...TEST_ENV } };
}

export async function dropTestDatabase(db: TestDb): Promise<void> {
  const client = new pg.Client({ connectionString: db.env.DATABASE_SUPER_URL });
  await client.connect();
  try {
    await client.query(`DROP DATABASE IF EXISTS ${db.name} WITH (FORCE)`);
  } finally {
    await client.end();
  }
}
