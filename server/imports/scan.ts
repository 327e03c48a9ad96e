/**
 * The first look at an upload: which sheets it holds (by name), their header rows, how many data
 * rows, and the automatic column mapping. Refuses a file with no known sheet, a missing or
 * duplicated header, no data rows, or more rows than IMPORT_MAX_ROWS.
 */
import { AppError } from '../http/errors.js';
import { DICTIONARY_SHEET, LISTS_SHEET, README_SHEET, SHEET_NAMES, autoMapHeader, kindOfSheet, type RecordKind } from '../../shared/imports/fields.js';
import type { SheetInfo } from '../../shared/imports/api.js';
import { columnLetter, rawText } from './cells.js';
import { csvSheet, isEmptyRow, xlsxSheets, type RawSheet } from './reader.js';
import type { UploadType } from './file-check.js';

const IGNORED = new Set([DICTIONARY_SHEET, LISTS_SHEET, README_SHEET, 'Problems'].map((s) => s.toLowerCase()));

/** Header texts of a row; a blank header becomes "(column C)" so it can still be mapped or dropped. */
export function headerTexts(values: readonly unknown[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < values.length; i++) out.push(rawText(values[i])?.trim() || `(column ${columnLetter(i + 1)})`);
  while (out.length && /^\(column [A-Z]+\)$/.test(out[out.length - 1])) out.pop();
  return out;
}

export function duplicateHeaders(headers: readonly string[]): string[] {
  const seen = new Map<string, number>();
  const dups: string[] = [];
  headers.forEach((h, i) => {
    const k = h.trim().toLowerCase();
    if (seen.has(k)) dups.push(`"${h}" in columns ${columnLetter(seen.get(k)! + 1)} and ${columnLetter(i + 1)}`);
    else seen.set(k, i);
  });
  return dups;
}

/**
 * Every sheet of the file that Alveolog will read, with the record kind it holds. `kindFor`
 * names the kind of a sheet (or null: skip it); a CSV is one sheet of the declared kind.
 */
export async function* recognisedSheets(filePath: string, type: UploadType, kindFor: (sheetName: string) => RecordKind | null, fileName: string): AsyncGenerator<RawSheet & { kind: RecordKind }> {
  if (type === 'csv') {
    const kind = kindFor(fileName);
    if (kind) yield { ...csvSheet(filePath, fileName), kind };
    return;
  }
  for await (const sheet of xlsxSheets(filePath)) {
    const kind = kindFor(sheet.name);
    if (!kind) {
      for await (const _ of sheet.rows) void _; // drain: the reader is one pass over the zip
      continue;
    }
    yield { ...sheet, kind };
  }
}

/**
 * A workbook's sheets are recognised by name (Cases, Therapy episodes, Outcomes); a workbook of
 * one other sheet holds the kind declared with the upload.
 */
export function kindResolver(type: UploadType, sheetNames: readonly string[], defaultKind: RecordKind): (name: string) => RecordKind | null {
  if (type === 'csv') return () => defaultKind;
  const data = sheetNames.filter((n) => !IGNORED.has(n.toLowerCase()));
  const lone = data.length === 1 && !sheetNames.some((n) => kindOfSheet(n));
  return (name) => kindOfSheet(name) ?? (lone && name === data[0] ? defaultKind : null);
}

export interface ScanResult { sheets: SheetInfo[]; totalRows: number }

/** Header row, data-row count and duplicate check of one sheet (a single pass over its rows). */
async function scanSheet(sheet: RawSheet, counted: () => number, maxRows: number): Promise<{ headers: string[]; rows: number }> {
  let headers: string[] | null = null;
  let rows = 0;
  for await (const row of sheet.rows) {
    if (headers === null) {
      if (isEmptyRow(row.values)) continue;
      if (row.number !== 1) {
        throw new AppError(400, 'missing_header', `sheet "${sheet.name}" has no header row: row 1 is empty`, { hint: 'put the column headers in row 1 (download the template to see them)' });
      }
      headers = headerTexts(row.values);
      const dups = duplicateHeaders(headers);
      if (dups.length) throw new AppError(400, 'duplicate_header', `sheet "${sheet.name}" has the same header twice: ${dups.join('; ')}`, { hint: 'rename or delete one of the columns so every header is different' });
      continue;
    }
    if (isEmptyRow(row.values)) continue;
    rows++;
    if (counted() + rows > maxRows) {
      throw new AppError(400, 'too_many_rows', `the file has more than ${maxRows.toLocaleString('en')} rows, the most one import takes`, { hint: 'split the file into smaller ones and import them one after the other' });
    }
  }
  return { headers: headers ?? [], rows };
}

/** Scans the whole upload once. `maxRows` is IMPORT_MAX_ROWS. */
export async function scanUpload(filePath: string, type: UploadType, defaultKind: RecordKind, fileName: string, maxRows: number): Promise<ScanResult> {
  const found: { name: string; kind: RecordKind | null; headers: string[]; rows: number }[] = [];
  let total = 0;
  const sheets: AsyncIterable<RawSheet> = type === 'csv' ? (async function* () { yield csvSheet(filePath, fileName); })() : xlsxSheets(filePath);
  for await (const sheet of sheets) {
    const kind = type === 'csv' ? defaultKind : kindOfSheet(sheet.name);
    if (IGNORED.has(sheet.name.toLowerCase())) {
      for await (const _ of sheet.rows) void _; // drain: the reader is one pass over the zip
      continue;
    }
    const dup = kind && found.find((f) => f.kind === kind);
    if (dup) {
      throw new AppError(400, 'duplicate_sheet', `the workbook has two sheets for ${SHEET_NAMES[kind].toLowerCase()} ("${dup.name}" and "${sheet.name}")`, { hint: 'keep one sheet per record kind, or rename the extra one' });
    }
    const r = await scanSheet(sheet, () => total, maxRows);
    total += r.rows;
    found.push({ name: sheet.name, kind, ...r });
  }
  const resolve = kindResolver(type, found.map((f) => f.name), defaultKind);
  const kept = found.map((f) => ({ ...f, kind: resolve(f.name) })).filter((f): f is typeof f & { kind: RecordKind } => f.kind !== null);
  if (!kept.length) {
    throw new AppError(400, 'missing_sheet', `the workbook has no sheet named ${Object.values(SHEET_NAMES).map((n) => `"${n}"`).join(', ')} (found: ${found.map((n) => `"${n.name}"`).join(', ') || 'none'})`, {
      hint: 'name the sheet of cases "Cases" (therapy: "Therapy episodes", outcomes: "Outcomes"), as in the template',
    });
  }
  const rowsTotal = kept.reduce((n, f) => n + f.rows, 0);
  if (rowsTotal === 0) {
    throw new AppError(400, 'no_rows', `the file has headers but no data rows (${kept.map((s) => `"${s.name}"`).join(', ')})`, { hint: 'add one row per case below the header row' });
  }
  return {
    sheets: kept.map((f) => ({ kind: f.kind, sheet: f.name, headers: f.headers, rows: f.rows, proposed: Object.fromEntries(f.headers.map((h) => [h, autoMapHeader(f.kind, h)])) })),
    totalRows: rowsTotal,
  };
}
