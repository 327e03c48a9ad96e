import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { entities } from './entities/index.js';
import { migrations } from './migrations/index.js';

/** Builds a DataSource for a connection string (the app's role at run time, the owner for migrations). */
export function createDataSource(url: string, poolMax = Number(process.env.DB_POOL_MAX ?? 20)): DataSource {
  return new DataSource({
    type: 'postgres',
    uuidExtension: 'pgcrypto',
    installExtensions: false,
    url,
    entities,
    migrations,
    synchronize: false,
    logging: false,
    // JIT off on every connection: the planner over-estimates the small aggregates of an
    // interactive page and would spend ~100 ms compiling them (seen on the 1M-case bench); set
    // here, not per transaction, so a read needs no BEGIN / SET LOCAL / COMMIT round trips.
    extra: { max: poolMax, connectionTimeoutMillis: 3000, statement_timeout: 120_000, options: '-c jit=off' },
  });
}
