/** Helpers for the import tests: build workbooks and CSV files, upload them, run the queued job. */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import type { TestApp, Client } from '../helpers.js';
import { runOne } from '../../../server/jobs/jobs.service.js';

export type Cell = string | number | boolean | Date | null | { formula: string; result?: unknown };

/** An xlsx with the given sheets (first row = headers). */
export async function workbook(sheets: Record<string, Cell[][]>): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  for (const [name, rows] of Object.entries(sheets)) {
    const ws = wb.addWorksheet(name);
    for (const r of rows) ws.addRow(r as unknown[]);
  }
  return Buffer.from(await wb.xlsx.writeBuffer());
}

export async function siteId(t: TestApp, code: string): Promise<string> {
  const [r] = await t.ds.query(`SELECT id FROM sites WHERE code = $1`, [code]);
  return r.id;
}

export function upload(c: Client, file: Buffer, name: string, fields: Record<string, string>) {
  let req = c.agent.post('/api/imports').set('x-csrf-token', c.csrf);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', file, name);
}

/** Runs queued jobs until none is left (the runner would do it in the background). */
export async function drainJobs(t: TestApp): Promise<void> {
  while (await runOne(t.context)) { /* next */ }
}

/** The proposed mapping of an upload, with unmapped headers dropped (null). */
export function proposedMapping(view: { sheets: { kind: string; proposed: Record<string, string | null> }[] }) {
  return Object.fromEntries(view.sheets.map((s) => [s.kind, s.proposed]));
}

/** Upload, dry run with the proposed mapping; returns the import view after the dry run. */
export async function uploadAndDryRun(t: TestApp, c: Client, file: Buffer, name: string, fields: Record<string, string>, mapping?: Record<string, Record<string, string | null>>) {
  const up = await upload(c, file, name, fields);
  if (up.status !== 201) throw new Error(`upload answered ${up.status} ${JSON.stringify(up.body)}`);
  const dr = await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping: mapping ?? proposedMapping(up.body) });
  if (dr.status !== 202) throw new Error(`dry run answered ${dr.status} ${JSON.stringify(dr.body)}`);
  await drainJobs(t);
  const view = (await c.get(`/api/imports/${up.body.id}`)).body;
  return { up, dr, view };
}

/** A fresh DATA_DIR per test file, so the upload folder holds only this file's uploads. */
export function freshDataDir(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-imports-'));
}
