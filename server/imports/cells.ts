/**
 * Reading one spreadsheet cell into the value a registry field expects, before the shared zod
 * schema validates it: text, numbers with the declared decimal separator, yes/no, ISO dates or
 * Excel date serials, codes (or their labels) and lists of codes. Formulas are never evaluated.
 */
import type { CellKind, ImportColumn } from '../../shared/imports/fields.js';
import type { DecimalSeparator } from '../../shared/imports/api.js';

export type CellResult = { ok: true; value: unknown } | { ok: false; message: string; hint: string };

export interface CellOptions {
  decimal: DecimalSeparator;
  /** Today in the network's time zone (YYYY-MM-DD): later dates are refused. */
  today: string;
}

/**
 * Text that a spreadsheet program would run as a formula (=, +, -, @, tab, carriage return
 * first) gets a leading apostrophe so it stays inert text wherever it goes next (OWASP,
 * "CSV Injection"). Numbers are never passed through here, so -2 stays the number -2.
 */
export function neutraliseText(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

/** What a raw cell from exceljs or csv-parse holds, as text (formula cells as their formula). */
export function rawText(raw: unknown): string | null {
  if (raw === null || raw === undefined) return null;
  if (typeof raw === 'string') return raw;
  if (typeof raw === 'number' || typeof raw === 'boolean') return String(raw);
  if (raw instanceof Date) return raw.toISOString().slice(0, 10);
  if (typeof raw === 'object') {
    const o = raw as { richText?: { text: string }[]; formula?: string; sharedFormula?: string; text?: string; error?: string };
    if (o.richText) return o.richText.map((r) => r.text).join('');
    if (o.formula !== undefined || o.sharedFormula !== undefined) return `=${o.formula ?? o.sharedFormula}`;
    if (o.text !== undefined) return String(o.text);
    if (o.error !== undefined) return String(o.error);
  }
  return String(raw);
}

const isFormula = (raw: unknown) => typeof raw === 'object' && raw !== null && ('formula' in raw || 'sharedFormula' in raw);

const MS_DAY = 86_400_000;
/**
 * Excel's 1900 date system: serial 1 = 1900-01-01; serial 60 is the non-existent 1900-02-29
 * Excel keeps for Lotus 1-2-3 compatibility, so from serial 61 on day 0 is 1899-12-30
 * (Microsoft, "Differences between the 1900 and the 1904 date system in Excel").
 */
export function excelSerialToIso(serial: number): string | null {
  if (!Number.isFinite(serial) || serial < 1 || serial >= 2_958_466 || Math.floor(serial) === 60) return null;
  const day = Math.floor(serial);
  const base = day < 60 ? Date.UTC(1899, 11, 31) : Date.UTC(1899, 11, 30);
  return new Date(base + day * MS_DAY).toISOString().slice(0, 10);
}

function validIso(s: string): boolean {
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

const YES = new Set(['yes', 'y', 'true', '1', 'ja', 'sim', 'oui', 'sí', 'si']);
const NO = new Set(['no', 'n', 'false', '0', 'nein', 'não', 'nao', 'non']);

function readNumber(raw: unknown, text: string, decimal: DecimalSeparator, integer: boolean, unit?: string): CellResult {
  if (typeof raw === 'number') return Number.isFinite(raw) ? { ok: true, value: raw } : { ok: false, message: 'is not a number', hint: 'enter a number' };
  const s = text.trim().replace(/[\s\u00a0]/g, '');
  const pattern = decimal === 'comma' ? /^[+-]?\d+(,\d+)?$/ : /^[+-]?\d+(\.\d+)?$/;
  const other = decimal === 'comma' ? /^[+-]?\d+\.\d+$/ : /^[+-]?\d+,\d+$/;
  if (!pattern.test(s)) {
    if (other.test(s)) {
      return { ok: false, message: `"${text}" uses a decimal ${decimal === 'comma' ? 'point' : 'comma'}, but this upload declared a decimal ${decimal}`,
        hint: `write it as ${decimal === 'comma' ? s.replace('.', ',') : s.replace(',', '.')} or upload again declaring the decimal ${decimal === 'comma' ? 'point' : 'comma'}` };
    }
    return { ok: false, message: `"${text}" is not a number`, hint: `enter ${integer ? 'a whole number' : 'a number'}${unit ? ` in ${unit}` : ''}, digits only${integer ? '' : ` with a decimal ${decimal}`}` };
  }
  return { ok: true, value: Number(decimal === 'comma' ? s.replace(',', '.') : s) };
}

function readDate(raw: unknown, text: string, today: string): CellResult {
  let iso: string | null = null;
  if (raw instanceof Date) iso = raw.toISOString().slice(0, 10);
  else if (typeof raw === 'number') iso = excelSerialToIso(raw);
  else {
    const s = text.trim();
    const m = /^(\d{4}-\d{2}-\d{2})(?:[T ]00:00(?::00(?:\.0+)?)?Z?)?$/.exec(s);
    if (m && validIso(m[1])) iso = m[1];
    else if (/^\d{1,7}(\.\d+)?$/.test(s)) iso = excelSerialToIso(Number(s));
  }
  if (!iso) return { ok: false, message: `"${text}" is not a date`, hint: 'write the date as YYYY-MM-DD (e.g. 2026-03-14) or format the cell as a date in the spreadsheet' };
  if (iso > today) return { ok: false, message: `the date ${iso} is in the future (today is ${today})`, hint: 'check the year and month; dates of events cannot be later than today' };
  return { ok: true, value: iso };
}

function readCode(text: string, cell: Extract<CellKind, { type: 'code' | 'codes' }>): string | null {
  const s = text.trim().toLowerCase();
  const byCode = cell.codes.find((c) => c.toLowerCase() === s);
  if (byCode) return byCode;
  const byLabel = cell.codes.find((c) => cell.labels[c]?.toLowerCase() === s);
  return byLabel ?? null;
}

/** Reads one cell for a column; empty cells give null (no value). */
export function readCell(raw: unknown, col: ImportColumn, opts: CellOptions): CellResult {
  const text = rawText(raw);
  if (text === null || text.trim() === '') return { ok: true, value: null };
  const cell = col.cell;
  if (isFormula(raw) && cell.type !== 'text') {
    return { ok: false, message: 'the cell holds a formula; formulas are not evaluated on import', hint: 'replace the formula by its value (copy, then paste values only)' };
  }
  switch (cell.type) {
    case 'text': {
      const s = text.trim();
      if (cell.maxLength && s.length > cell.maxLength) {
        return { ok: false, message: `the text is ${s.length} characters long, over the limit of ${cell.maxLength}`, hint: `shorten it to at most ${cell.maxLength} characters` };
      }
      return { ok: true, value: col.identifier ? s : neutraliseText(s) };
    }
    case 'number': return readNumber(raw, text, opts.decimal, cell.integer, col.unit);
    case 'boolean': {
      if (typeof raw === 'boolean') return { ok: true, value: raw };
      const s = text.trim().toLowerCase();
      if (YES.has(s)) return { ok: true, value: true };
      if (NO.has(s)) return { ok: true, value: false };
      return { ok: false, message: `"${text}" is not yes or no`, hint: 'write yes or no (or true/false, 1/0)' };
    }
    case 'date': return readDate(raw, text, opts.today);
    case 'code': {
      const code = readCode(text, cell);
      return code ? { ok: true, value: code } : { ok: false, message: `"${text}" is not one of the allowed values`, hint: `use one of: ${cell.codes.join(', ')} (see the Lists sheet of the template)` };
    }
    case 'codes': {
      const parts = text.split(/[;,|]/).map((p) => p.trim()).filter(Boolean);
      const out: string[] = [];
      for (const p of parts) {
        const code = readCode(p, cell);
        if (!code) return { ok: false, message: `"${p}" is not one of the allowed values`, hint: `use codes from: ${cell.codes.join(', ')}, separated by ;` };
        out.push(code);
      }
      return { ok: true, value: out };
    }
  }
}

/** Column letter for a 1-based column number (1 = A, 27 = AA). */
export function columnLetter(n: number): string {
  let s = '';
  for (let x = n; x > 0; x = Math.floor((x - 1) / 26)) s = String.fromCharCode(65 + ((x - 1) % 26)) + s;
  return s;
}
