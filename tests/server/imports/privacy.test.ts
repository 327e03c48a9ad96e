/**
 * Hospital exports carry names and record numbers: a record number and a name planted in an
 * upload (in unmapped columns, and the record number also in the hospital-identifier column)
 * must reach neither the database (every text, character, json/jsonb and array column of every
 * table), nor the server's log file, nor the upload folder once the imports are committed or
 * abandoned, nor the problems download.
 */
import { testDbEnv } from '../../setup/db-env.js';
import fs from 'node:fs';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createDataSource } from '../../../server/db/create-data-source.js';
import { freshDataDir, upload, workbook } from './support.js';
import { startServerProcess, waitFor, type ServerProcess } from './server-process.js';

// Fictional identifiers planted for the test (no real person or record).
const RECORD_NUMBER = 'QZ7731946';
const NAME = 'Philippa Wrexham-Oddbody';
const NEEDLES = [RECORD_NUMBER, NAME, 'Wrexham-Oddbody', '7731946'];

let db: DataSource;
let server: ServerProcess;
const dataDir = freshDataDir();
const logFile = path.join(dataDir, 'server.log');

beforeAll(async () => {
  db = await createDataSource(testDbEnv().DATABASE_OWNER_URL ?? testDbEnv().DATABASE_URL, 2).initialize();
  // info level: the most the server logs in production.
  server = await startServerProcess({ DATA_DIR: dataDir, LOG_FILE: logFile, LOG_LEVEL: 'debug' });
});
afterAll(async () => {
  await server?.stop();
  await db.destroy();
});

/** Every table's text-like columns, searched for each needle (case-insensitive). */
async function databaseHits(): Promise<string[]> {
  const cols: { table_name: string; column_name: string }[] = await db.query(
    `SELECT c.table_name, c.column_name FROM information_schema.columns c JOIN information_schema.tables t ON t.table_name = c.table_name AND t.table_schema = c.table_schema
      WHERE c.table_schema = 'public' AND t.table_type = 'BASE TABLE' AND (c.data_type IN ('text', 'character varying', 'character', 'json', 'jsonb', 'ARRAY', 'bytea'))`,
  );
  expect(cols.length).toBeGreaterThan(20);
  const hits: string[] = [];
  for (const { table_name, column_name } of cols) {
    for (const n of NEEDLES) {
      const [{ k }] = await db.query(`SELECT count(*)::int AS k FROM "${table_name}" WHERE "${column_name}"::text ILIKE $1`, [`%${n}%`]);
      if (k) hits.push(`${table_name}.${column_name} holds "${n}"`);
    }
  }
  return hits;
}

function folderHits(dir: string): string[] {
  const hits: string[] = [];
  for (const f of fs.readdirSync(dir, { recursive: true }) as string[]) {
    const full = path.join(dir, f);
    if (!fs.statSync(full).isFile() || full === logFile) continue;
    const text = fs.readFileSync(full).toString('latin1');
    for (const n of NEEDLES) if (text.toLowerCase().includes(n.toLowerCase())) hits.push(`${f} holds "${n}"`);
  }
  return hits;
}

describe('privacy of uploads', () => {
  it('when a record number and a name are planted in uploads, then neither is found in the database, the log file, the upload folder or the problems download', async () => {
    const c = await server.as('abstractor');
    const [site] = await db.query(`SELECT id FROM sites WHERE code = 'HBR'`);
    const header = ['Patient name', 'MRN', 'Case key (this file only)', 'Hospital identifier', 'Surgery date', 'Age', 'Sex'];
    const mistaken = await workbook({ Cases: [header, [NAME, RECORD_NUMBER, 'P1', RECORD_NUMBER, '2026-09-09', 'forty', 'female'], [NAME, RECORD_NUMBER, 'P2', `${RECORD_NUMBER}-${'9'.repeat(70)}`, '2026-09-09', 40, 'female']] });
    const clean = await workbook({ Cases: [header, [NAME, RECORD_NUMBER, 'P1', RECORD_NUMBER, '2026-09-09', 41, 'female'], [NAME, RECORD_NUMBER, 'P2', RECORD_NUMBER, '2026-09-09', 42, 'female']] });
    const ids: string[] = [];
    for (const [file, name] of [[mistaken, 'mistaken.xlsx'], [clean, 'clean.xlsx']] as const) {
      const up = await upload(c, file, name, { siteId: site.id, decimal: 'point' });
      expect(up.status, JSON.stringify(up.body)).toBe(201);
      expect(JSON.stringify(up.body)).not.toContain(RECORD_NUMBER);
      const proposed = up.body.sheets[0].proposed;
      expect(proposed).toMatchObject({ 'Patient name': null, MRN: null, 'Hospital identifier': 'localIdentifier' });
      const dr = await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping: { cases: proposed } });
      expect(dr.status).toBe(202);
      await waitFor('the dry run', async () => (await c.get(`/api/imports/${up.body.id}`)).body.status === 'validated');
      ids.push(up.body.id);
    }
    const [bad, good] = ids;
    const problems = (await c.get(`/api/imports/${bad}/problems`)).body;
    expect(problems.total).toBeGreaterThanOrEqual(2);
    for (const n of NEEDLES) expect(JSON.stringify(problems)).not.toContain(n);
    const x = await c.get(`/api/imports/${bad}/problems.xlsx`).buffer(true).parse((res, cb) => { const b: Buffer[] = []; res.on('data', (d: Buffer) => b.push(d)); res.on('end', () => cb(null, Buffer.concat(b))); });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(x.body as unknown as ArrayBuffer);
    const texts: string[] = [];
    wb.eachSheet((ws) => ws.eachRow((r) => r.eachCell((cell) => { texts.push(String(cell.value ?? ''), String(cell.note ?? '')); })));
    for (const n of NEEDLES) expect(texts.join('\n')).not.toContain(n);
    expect((await c.post(`/api/imports/${bad}/abandon`)).status).toBe(200);
    expect((await c.post(`/api/imports/${good}/commit`, { existing: 'skip' })).status).toBe(202);
    await waitFor('the commit', async () => (await c.get(`/api/imports/${good}`)).body.status === 'committed');
    // The duplicate warning (same identifier and date twice) was raised from the keyed hash alone.
    const [kases] = await db.query(`SELECT count(*)::int AS n, count(identifier_hash)::int AS hashed, bool_or(possible_duplicate) AS dup FROM surgical_cases WHERE surgery_date = '2026-09-09' AND age IN (41, 42)`);
    expect(kases).toEqual({ n: 2, hashed: 2, dup: true });

    await server.stop();
    expect(await databaseHits()).toEqual([]);
    expect(folderHits(dataDir)).toEqual([]);
    const log = fs.existsSync(logFile) ? fs.readFileSync(logFile, 'utf8') : '';
    expect(log.length).toBeGreaterThan(0);
    for (const n of NEEDLES) expect(log.toLowerCase()).not.toContain(n.toLowerCase());
  });
});
