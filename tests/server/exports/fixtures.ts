/**
 * Test factories for the export tests: cases inserted straight into the registry table (the
 * analysis fact table follows by its triggers), and readers for the generated files that use
 * independent libraries (exceljs to read xlsx, jszip to open the zip, csv-parse for CSV).
 */
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { parse as parseCsv } from 'csv-parse/sync';
import type { DataSource } from 'typeorm';
import type { Client } from '../helpers.js';

export interface TestCase {
  site: string;
  unit?: string;
  age: number;
  sex: 'female' | 'male';
  category: string;
  surgery: string;
  admission?: string;
  discharge?: string;
  death?: string;
  status?: string;
}

let seq = 0;

/** Inserts cases with identifiers, free text and a keyed hash that must never leave in an export. */
export async function insertCases(ds: DataSource, cases: readonly TestCase[]): Promise<{ id: string; registryNumber: string; hash: string }[]> {
  const sites: { id: string; code: string }[] = await ds.query(`SELECT id, code FROM sites`);
  const units: { id: string; site_id: string; code: string }[] = await ds.query(`SELECT id, site_id, code FROM units`);
  const out: { id: string; registryNumber: string; hash: string }[] = [];
  for (const c of cases) {
    const site = sites.find((s) => s.code === c.site)!;
    const unit = units.find((u) => u.site_id === site.id && u.code === (c.unit ?? 'SURG-A'));
    seq += 1;
    const registryNumber = `${c.site}-${c.surgery.slice(0, 4)}-T${String(seq).padStart(5, '0')}`;
    const hash = `f00d${String(seq).padStart(60, '0')}`;
    const [row] = await ds.query(
      `INSERT INTO surgical_cases (registry_number, registry_year, registry_seq, site_id, unit_id, status, eligible, age, sex, asa_class, procedure_category, incision_site, approach, urgency, anaesthesia,
         duration_minutes, surgery_date, admission_date, discharge_date, died_30d, death_date, notes, exclusion_reason, identifier_hash, preop_spo2, preop_haemoglobin_g_dl, height_cm, weight_kg)
       VALUES ($1, $2, $3, $4, $5, $6, true, $7, $8, 'II', $9, 'upper-abdominal', 'open', 'elective', 'general', 95, $10, $11, $12, $13, $14,
         'Patient Jane Roe, MRN 4471-22, 12 Quay Street', 'called =HYPERLINK("http://x.invalid")', $15, 97, 12.5, 165.5, 70.2) RETURNING id`,
      [registryNumber, Number(c.surgery.slice(0, 4)), 90_000 + seq, site.id, unit?.id ?? null, c.status ?? 'verified', c.age, c.sex, c.category, c.surgery, c.admission ?? null, c.discharge ?? null, !!c.death, c.death ?? null, hash],
    );
    out.push({ id: row.id, registryNumber, hash });
  }
  return out;
}

/** GET a binary body (supertest buffers it). */
export async function download(c: Client, url: string): Promise<{ status: number; body: Buffer; headers: Record<string, string>; json: any }> {
  const r = await c.get(url).buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (d: Buffer) => chunks.push(d));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });
  const body = r.body as Buffer;
  let json: any = null;
  if (String(r.headers['content-type'] ?? '').includes('json')) json = JSON.parse(body.toString('utf8'));
  return { status: r.status, body, headers: r.headers as Record<string, string>, json };
}

export type SheetRows = { cells: ExcelJS.Cell[][]; values: unknown[][] };

/** Every sheet of an xlsx as rows of cells (exceljs's reader, independent of the writer path). */
export async function readXlsx(buf: Buffer): Promise<Map<string, SheetRows>> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(buf as unknown as ArrayBuffer);
  const out = new Map<string, SheetRows>();
  wb.eachSheet((ws) => {
    const cells: ExcelJS.Cell[][] = [];
    ws.eachRow({ includeEmpty: false }, (row) => {
      const r: ExcelJS.Cell[] = [];
      for (let i = 1; i <= ws.columnCount; i++) r.push(row.getCell(i));
      cells.push(r);
    });
    out.set(ws.name, { cells, values: cells.map((r) => r.map((c) => c.value)) });
  });
  return out;
}

/** The entries of a zip (jszip) as text. */
export async function readZip(buf: Buffer): Promise<Map<string, string>> {
  const zip = await JSZip.loadAsync(buf);
  const out = new Map<string, string>();
  for (const name of Object.keys(zip.files)) out.set(name, await zip.files[name].async('string'));
  return out;
}

export function readCsv(text: string): string[][] {
  return parseCsv(text, { bom: true, relax_column_count: false }) as string[][];
}

/** Rows of a table as objects keyed by the header. */
export function asObjects(rows: readonly unknown[][]): Record<string, unknown>[] {
  const [header, ...data] = rows;
  return data.map((r) => Object.fromEntries((header as string[]).map((h, i) => [h, r[i] ?? null])));
}
