import { testDbEnv } from '../setup/db-env.js';
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
// @ts-expect-error plain ESM module without types
import { backupDatabase, restoreDatabase } from '../../server/bootstrap/backup-lib.mjs';
import { migrate } from '../../server/db/migrate.js';

/** Row count and an md5 over every row (in a stable order) of every table. */
async function fingerprint(url: string): Promise<Record<string, { rows: number; md5: string }>> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    const { rows: tables } = await c.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename`);
    const out: Record<string, { rows: number; md5: string }> = {};
    for (const { tablename } of tables) {
      const { rows } = await c.query(`SELECT count(*)::int AS n, md5(coalesce(string_agg(t::text, '|' ORDER BY t::text), '')) AS h FROM "${tablename}" t`);
      out[tablename] = { rows: rows[0].n, md5: rows[0].h };
    }
    return out;
  } finally {
    await c.end();
  }
}

describe('backup and restore', () => {
  it('when the database is backed up, destroyed and restored, then every table has the same rows (count and checksum)', async () => {
    const env = testDbEnv();
    // A scratch copy of this run's database, so the other tests keep theirs.
    const name = `${new URL(env.DATABASE_OWNER_URL).pathname.slice(1)}_bk`;
    const superUrl = env.DATABASE_SUPER_URL;
    const s = new pg.Client({ connectionString: superUrl });
    await s.connect();
    const owner = decodeURIComponent(new URL(env.DATABASE_OWNER_URL).username);
    // The template is rebuilt under this advisory lock by tests/setup/test-cluster.ts.
    await s.query('SELECT pg_advisory_lock(424242)');
    await s.query(`CREATE DATABASE ${name} TEMPLATE alveolog_template OWNER ${owner}`);
    await s.query('SELECT pg_advisory_unlock(424242)');
    const ownerUrl = env.DATABASE_OWNER_URL.replace(/\/[^/]+$/, `/${name}`);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-backup-'));
    try {
      const before = await fingerprint(ownerUrl);
      expect(Object.keys(before).length).toBeGreaterThan(5);
      const file = backupDatabase({ pgBin: env.PG_BIN, ownerUrl, dir });
      // The backup holds health data: owner-only file and folder (OWASP ASVS 4.0.3 V8.1.6 spirit).
      expect(fs.statSync(file).mode & 0o777).toBe(0o600);
      expect(fs.statSync(dir).mode & 0o777).toBe(0o700);
      await s.query(`DROP DATABASE ${name} WITH (FORCE)`);
      restoreDatabase({ pgBin: env.PG_BIN, ownerUrl, superUrl, file });
      await migrate(ownerUrl, env.DATABASE_APP_ROLE);
      const after = await fingerprint(ownerUrl);
      expect(after).toEqual(before);
    } finally {
      await s.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      await s.end();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});
