// The `npm start` cluster and the environment the server runs with (shared by start, dev, create-admin, backup).
import path from 'node:path';
import fs from 'node:fs';
import { ensureNodeModules, cluster, ensureDatabase, dbEnv, ensureSecret } from './lib.mjs';

export function prepareMain() {
  ensureNodeModules();
  const pgPort = Number(process.env.ALVEOLOG_PG_PORT ?? 54321);
  const pg = cluster({ name: 'main', port: pgPort });
  const { startedHere } = pg.start();
  const roles = ensureDatabase(pg, 'alveolog');
  const port = Number(process.env.PORT ?? 3000);
  const demo = process.env.DEMO_MODE !== 'false';
  const env = {
    ...dbEnv(pg, 'alveolog', roles),
    NODE_ENV: process.env.NODE_ENV ?? 'production',
    PORT: String(port),
    APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${port}`,
    SESSION_SECRET: process.env.SESSION_SECRET ?? ensureSecret(pg.dir, 'session.secret'),
    IDENTIFIER_HASH_SECRET: process.env.IDENTIFIER_HASH_SECRET ?? ensureSecret(pg.dir, 'identifier-hash.secret'),
    DEMO_MODE: String(demo),
    SEED_DEMO: String(demo),
    SMTP_STANDIN: process.env.SMTP_HOST ? 'false' : 'true',
    SMTP_PORT: process.env.SMTP_PORT ?? String(pgPort + 1000),
    DATA_DIR: process.env.DATA_DIR ?? path.join(pg.dir, 'files'),
    LOG_FILE: process.env.LOG_FILE ?? path.join(pg.dir, 'server.log'),
  };
  fs.mkdirSync(env.DATA_DIR, { recursive: true, mode: 0o700 });
  return { pg, env, startedHere, port };
}
