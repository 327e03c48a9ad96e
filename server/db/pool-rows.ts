/**
 * Reads straight on the pg pool under a TypeORM DataSource. `DataSource.query` builds a query
 * runner, takes and releases a pooled client and notifies its subscribers on every call: 0.4 ms
 * a query here (site-2y cohort rates, 1,000,000 cases: 4.45 ms through ds.query, 4.04 ms on the
 * pool, same text), a tenth of a small cohort's whole SQL. For single-statement reads outside a
 * transaction; errors are pg's own (the error handler reads their SQLSTATE codes either way).
 */
import type { DataSource } from 'typeorm';
import type pg from 'pg';

/** The DataSource's pg pool (the postgres driver's `master`), or null for another driver. */
export function poolOf(ds: DataSource): pg.Pool | null {
  return (ds.driver as unknown as { master?: pg.Pool }).master ?? null;
}

/** Rows of one read, sent as an unnamed statement on the DataSource's pool. */
export async function poolRows<T = Record<string, any>>(ds: DataSource, text: string, params: readonly unknown[] = []): Promise<T[]> {
  const pool = poolOf(ds);
  if (!pool) return ds.query(text, [...params]);
  return (await pool.query(text, [...params])).rows as T[];
}
