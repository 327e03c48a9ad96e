import { testDbEnv } from '../setup/db-env.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
// @ts-expect-error plain ESM module without types
import { cluster, ensureDatabase, dbEnv } from '../../server/bootstrap/lib.mjs';
import { migrate } from '../../server/db/migrate.js';
import { createDataSource } from '../../server/db/create-data-source.js';
import { createApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { createMailer } from '../../server/mail/mailer.js';
import type { DataSource } from 'typeorm';
import { TEST_PG_PORT } from '../setup/test-cluster.js';

// A cluster of its own, so stopping PostgreSQL does not disturb the other tests.
const pg = cluster({ name: 'dbdown', port: TEST_PG_PORT + 10, fast: true });
let ds: DataSource;
let app: ReturnType<typeof createApp>;

beforeAll(async () => {
  pg.start();
  const roles = ensureDatabase(pg, 'alveolog_dbdown');
  const env = { ...dbEnv(pg, 'alveolog_dbdown', roles), ...testDbEnv(), ...dbEnv(pg, 'alveolog_dbdown', roles) } as Record<string, string>;
  await migrate(env.DATABASE_OWNER_URL, env.DATABASE_APP_ROLE);
  const config = loadConfig(env as NodeJS.ProcessEnv);
  ds = await createDataSource(config.DATABASE_URL, 3).initialize();
  app = createApp({ ds, readDs: ds, config, mailer: createMailer(config) });
}, 120_000);

afterAll(async () => {
  pg.start();
  await ds?.destroy();
  await (app?.locals.sessionPool as { end(): Promise<void> } | undefined)?.end();
  pg.stop();
});

describe('PostgreSQL stopped while the server runs', () => {
  it('when the database goes away, then requests answer 503 quickly with a clear message and the server recovers when it is back', async () => {
    expect((await request(app).get('/api/health')).body).toEqual({ status: 'ok', database: 'ok' });
    const agent = request.agent(app);
    const { body: { csrfToken } } = await agent.get('/api/auth/csrf');
    pg.stop();
    const t0 = Date.now();
    const down = await request(app).get('/api/health');
    expect(down.status).toBe(503);
    expect(down.body).toEqual({ status: 'degraded', database: 'unavailable' });
    const api = await agent.post('/api/auth/password-reset').set('x-csrf-token', csrfToken).send({ email: 'someone@tidewater.example' });
    expect(api.status, JSON.stringify(api.body)).toBe(503);
    expect(api.body.error.code).toBe('database_unavailable');
    expect(api.body.error.message).toMatch(/database/);
    expect(Date.now() - t0).toBeLessThan(8000);
    pg.start();
    let back = 0;
    for (let i = 0; i < 30 && back !== 200; i++) {
      back = (await request(app).get('/api/health')).status;
      if (back !== 200) await new Promise((r) => setTimeout(r, 300));
    }
    expect(back).toBe(200);
    expect((await agent.post('/api/auth/password-reset').set('x-csrf-token', csrfToken).send({ email: 'someone@tidewater.example' })).status).toBe(202);
  }, 60_000);
});
