import { testDbEnv } from '../setup/db-env.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import request from 'supertest';
// @ts-expect-error plain ESM module without types
import { cluster, standby, ensureDatabase, dbEnv } from '../../server/bootstrap/lib.mjs';
import { migrate } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed/demo.js';
import { createDataSource } from '../../server/db/create-data-source.js';
import { createApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { createMailer } from '../../server/mail/mailer.js';
import { Client, demoEmail } from './helpers.js';
import type { DataSource } from 'typeorm';
import { TEST_PG_PORT } from '../setup/test-cluster.js';

// Growth past one machine with PostgreSQL's own streaming replication: analysis and export
// routes read from a hot standby (DATABASE_REPLICA_URL) while writes go to the primary.
// A primary of its own keeps the standby small and leaves the shared test cluster alone.
const primary = cluster({ name: 'replica-primary', port: TEST_PG_PORT + 30, fast: true });
const replica = standby(primary, { name: 'replica-standby', port: TEST_PG_PORT + 40 });
let ds: DataSource;
let readDs: DataSource;
let app: ReturnType<typeof createApp>;
let ownerDs: DataSource;

beforeAll(async () => {
  primary.start();
  const roles = ensureDatabase(primary, 'alveolog_replica');
  const env = { ...testDbEnv(), ...dbEnv(primary, 'alveolog_replica', roles) } as Record<string, string>;
  await migrate(env.DATABASE_OWNER_URL, env.DATABASE_APP_ROLE);
  ownerDs = await createDataSource(env.DATABASE_OWNER_URL, 2).initialize();
  const [{ n }] = await ownerDs.query(`SELECT count(*)::int AS n FROM users`);
  if (n === 0) await seedDemo(ownerDs, { bcryptCost: 4 });
  // A fresh standby each run, so it never waits for WAL the primary has recycled.
  replica.stop();
  fs.rmSync(replica.dir, { recursive: true, force: true });
  replica.start();
  // The same role and database on the standby (its own port and socket).
  const replicaUrl = dbEnv(replica, 'alveolog_replica', roles).DATABASE_URL as string;
  const config = loadConfig({ ...env, DATABASE_REPLICA_URL: replicaUrl } as NodeJS.ProcessEnv);
  ds = await createDataSource(config.DATABASE_URL, 3).initialize();
  readDs = await createDataSource(replicaUrl, 3).initialize();
  app = createApp({ ds, readDs, config, mailer: createMailer(config) });
}, 180_000);

afterAll(async () => {
  await readDs?.destroy();
  await ds?.destroy();
  await ownerDs?.destroy();
  await (app?.locals.sessionPool as { end(): Promise<void> } | undefined)?.end();
  replica.stop();
  primary.stop();
});

describe('read replica', () => {
  it('when replay on the standby is paused, then analysis answers from the standby while writes reach the primary', async () => {
    const [{ rec }] = await readDs.query('SELECT pg_is_in_recovery() AS rec');
    expect(rec).toBe(true);
    const analyst = new Client(request.agent(app));
    expect((await analyst.signIn(demoEmail('analyst'))).status).toBe(200);
    const size = async () => {
      const r = await analyst.get('/api/analysis/rates?from=2021-01-01&to=2026-12-31');
      expect(r.status).toBe(200);
      return r.body.size as number;
    };
    const before = await size();
    expect(before).toBeGreaterThan(1000);
    replica.psql('SELECT pg_wal_replay_pause()');
    try {
      // A change on the primary: ten analysed cases withdrawn (the roll-up triggers follow).
      await ownerDs.query(`UPDATE surgical_cases SET status = 'withdrawn', withdrawn_reason = 'replica test' WHERE id IN (SELECT id FROM surgical_cases WHERE status IN ('verified', 'locked') ORDER BY id LIMIT 10)`);
      // A write through the API goes to the primary even now.
      const name = `Replica check ${Date.now()}`;
      const saved = await analyst.post('/api/cohorts', { name, filter: {}, shared: false });
      expect(saved.status).toBe(201);
      expect((await ds.query(`SELECT count(*)::int AS n FROM saved_cohorts WHERE name = $1`, [name]))[0].n).toBe(1);
      expect(await size()).toBe(before);
    } finally {
      replica.psql('SELECT pg_wal_replay_resume()');
    }
    let after = before;
    for (let i = 0; i < 50 && after === before; i++) {
      await new Promise((r) => setTimeout(r, 200));
      after = await size();
    }
    expect(after).toBe(before - 10);
  }, 120_000);
});
