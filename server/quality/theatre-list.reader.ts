/**
 * Reads an uploaded theatre list (CSV or XLSX) with the import engineer's file check and row
 * readers (server/imports/file-check.ts, reader.ts), hashing each identifier with the
 * registry's keyed hash at once. Errors name the row and column, never the cell's value: an
 * identifier must not come back in a message.
 */
import { PROCEDURE_CATEGORIES, PROCEDURE_CATEGORY_LABELS, type ProcedureCategory } from '../../shared/clinical/codes.js';
import { THEATRE_LIST_COLUMNS, type TheatreListColumn } from '../../shared/quality/capture.js';
import type { ErrorField } from '../../shared/api/error.js';
import { AppError } from '../http/errors.js';
import { checkUpload } from '../imports/file-check.js';
import { csvSheet, isEmptyRow, xlsxSheets, type RawSheet } from '../imports/reader.js';
import { excelSerialToIso, rawText } from '../imports/cells.js';
import { identifierHash } from '../registry/identifier-hash.js';

export interface TheatreRow { operationDate: string; procedureCategory: ProcedureCategory; identifierHash: string }
export interface TheatreList { fileHash: string; rows: TheatreRow[] }

const norm = (s: string) => s.trim().toLowerCase().replace(/[\s_-]+/g, ' ');
const CATEGORY_BY_TEXT = new Map<string, ProcedureCategory>();
for (const c of PROCEDURE_CATEGORIES) {
  CATEGORY_BY_TEXT.set(norm(c), c);
  CATEGORY_BY_TEXT.set(norm(PROCEDURE_CATEGORY_LABELS[c]), c);
}

function isoDate(raw: unknown): string | null {
  if (raw instanceof Date) return Number.isNaN(raw.getTime()) ? null : raw.toISOString().slice(0, 10);
  if (typeof raw === 'number') return excelSerialToIso(raw);
  const t = rawText(raw)?.trim() ?? '';
  if (!/^\d{4}-\d{2}-\d{2}$/.test(t)) return null;
  const d = new Date(`${t}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === t ? t : null;
}

const MAX_LISTED = 50;

export async function readTheatreList(filePath: string, originalName: string, opts: { siteId: string; secret: string; maxRows: number }): Promise<TheatreList> {
  const facts = await checkUpload(filePath, originalName);
  let sheet: RawSheet | undefined;
  if (facts.type === 'csv') sheet = csvSheet(filePath, originalName);
  const problems: ErrorField[] = [];
  const rows: TheatreRow[] = [];
  const seen = new Map<string, number>();
  const consume = async (s: RawSheet) => {
    let header: Record<TheatreListColumn, number> | null = null;
    for await (const r of s.rows) {
      if (isEmptyRow(r.values)) continue;
      if (!header) {
        const texts = r.values.map((v) => norm(rawText(v) ?? ''));
        const found: Partial<Record<TheatreListColumn, number>> = {};
        const missing: string[] = [];
        for (const [col, names] of Object.entries(THEATRE_LIST_COLUMNS) as [TheatreListColumn, readonly string[]][]) {
          const i = texts.findIndex((t) => names.includes(t));
          if (i < 0) missing.push(`"${names[0]}"`);
          else found[col] = i;
        }
        if (missing.length) {
          throw new AppError(400, 'theatre_list_columns', `the first row of "${s.name}" has no column ${missing.join(', ')}`, {
            hint: `the first row must name the columns: ${Object.values(THEATRE_LIST_COLUMNS).map((n) => `"${n[0]}"`).join(', ')} (one operation per row below)`,
            fields: missing.map((m) => ({ path: 'file', message: `column ${m} is missing` })),
          });
        }
        header = found as Record<TheatreListColumn, number>;
        continue;
      }
      if (rows.length + problems.length >= opts.maxRows) {
        throw new AppError(400, 'too_many_rows', `the list has more than ${opts.maxRows} operations`, { hint: 'upload it in parts (e.g. one month per file)' });
      }
      const at = (c: string) => `row ${r.number}, ${c}`;
      const date = isoDate(r.values[header.operationDate]);
      const catText = norm(rawText(r.values[header.procedureCategory]) ?? '');
      const category = CATEGORY_BY_TEXT.get(catText);
      const ident = (rawText(r.values[header.localIdentifier]) ?? '').trim();
      let ok = true;
      if (!date) { problems.push({ path: at('operation date'), message: 'is not a date; write it as YYYY-MM-DD or use a date cell' }); ok = false; }
      if (!category) { problems.push({ path: at('procedure category'), message: `is not a known category; use one of ${PROCEDURE_CATEGORIES.join(', ')}` }); ok = false; }
      if (!ident) { problems.push({ path: at('local identifier'), message: 'is empty; every operation needs the hospital identifier' }); ok = false; }
      else if (ident.length > 64) { problems.push({ path: at('local identifier'), message: 'is longer than 64 characters' }); ok = false; }
      if (!ok) continue;
      const hash = identifierHash(opts.secret, opts.siteId, ident);
      const key = `${hash}|${date}`;
      const earlier = seen.get(key);
      if (earlier !== undefined) {
        problems.push({ path: at('local identifier'), message: `repeats row ${earlier} (same identifier and date); list each operation once` });
        continue;
      }
      seen.set(key, r.number);
      rows.push({ operationDate: date!, procedureCategory: category!, identifierHash: hash });
    }
  };
  if (sheet) await consume(sheet);
  else {
    for await (const s of xlsxSheets(filePath)) {
      await consume(s);
      break; // the first sheet is the list
    }
  }
  if (problems.length) {
    throw new AppError(400, 'theatre_list_invalid', `the theatre list has ${problems.length} problem${problems.length === 1 ? '' : 's'}; nothing was saved`, {
      hint: 'correct the rows listed in the file and upload it again',
      fields: problems.slice(0, MAX_LISTED),
      details: problems.length > MAX_LISTED ? { notListed: problems.length - MAX_LISTED } : undefined,
    });
  }
  if (!rows.length) throw new AppError(400, 'theatre_list_empty', 'the theatre list has no operations below its heading row', { hint: 'add one row per eligible operation and upload it again' });
  return { fileHash: facts.sha256, rows };
}
