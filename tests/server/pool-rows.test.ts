/**
 * Reads on the pg pool under the DataSource (server/db/pool-rows.ts), used by the analysis routes
 * instead of DataSource.query: the same rows for the same statement, pg's own errors with their
 * SQLSTATE (the error handler maps connection codes to 503), and the pooled client always given back.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { testDbEnv } from '../setup/db-env.js';
import { createDataSource } from '../../server/db/create-data-source.js';
import { poolOf, poolRows } from '../../server/db/pool-rows.js';

let ds: DataSource;
beforeAll(async () => { ds = await createDataSource(testDbEnv().DATABASE_URL, 2).initialize(); });
afterAll(async () => { await ds.destroy(); });

describe('reads on the DataSource pool', () => {
  it('when a parameterised read runs, then it gives the rows DataSource.query gives', async () => {
    const text = `SELECT s.code, s.name, count(*) OVER ()::int AS n FROM sites s WHERE s.code <> ALL($1::text[]) ORDER BY s.code`;
    const viaTypeorm = await ds.query(text, [['none']]);
    expect(viaTypeorm.length).toBeGreaterThan(0);
    expect(await poolRows(ds, text, [['none']])).toEqual(viaTypeorm);
  });

  it('when a statement fails, then the error is pg\'s with its SQLSTATE and the client goes back to the pool', async () => {
    // More failures than the pool has clients: a client kept after an error would exhaust it.
    for (let i = 0; i < 4; i++) {
      await expect(poolRows(ds, `SELECT 1 / $1::int AS x`, [0])).rejects.toMatchObject({ code: '22012' }); // division_by_zero, PostgreSQL Appendix A
    }
    expect(await poolRows(ds, `SELECT $1::int + 1 AS x`, [41])).toEqual([{ x: 42 }]);
    const pool = poolOf(ds)!;
    expect(pool.totalCount - pool.idleCount, 'clients still checked out').toBe(0);
  });
});
