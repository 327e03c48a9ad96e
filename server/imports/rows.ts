/**
 * One spreadsheet row through the mapping: the mapped cells read into field values (unmapped
 * columns are never looked at), problems named by sheet, row, column and cell, and zod issues
 * turned into problems on the column that holds the field.
 */
import type { z } from 'zod';
import { describeCell, type ImportColumn, type RecordKind, columnOf } from '../../shared/imports/fields.js';
import type { Problem } from '../../shared/imports/api.js';
import { identifierLikeContent } from '../../shared/registry/text.js';
import { fieldMeta } from '../../shared/registry/meta.js';
import { columnLetter, rawText, readCell, type CellOptions } from './cells.js';

export interface MappedColumn { index: number; header: string; letter: string; col: ImportColumn }

/** The mapped columns of a sheet, in file order; unmapped (dropped) columns are left out here. */
export function mappedColumns(kind: RecordKind, headers: readonly string[], mapping: Record<string, string | null>): MappedColumn[] {
  const out: MappedColumn[] = [];
  headers.forEach((h, i) => {
    const f = mapping[h];
    const col = f ? columnOf(kind, f) : undefined;
    if (col) out.push({ index: i, header: h, letter: columnLetter(i + 1), col });
  });
  return out;
}

const MAX_VALUE = 60;

/** The value shown in a problem: never the identifier, never free text that looks like one. */
export function shownValue(c: MappedColumn | undefined, raw: unknown): string | null {
  if (!c) return null;
  if (c.col.identifier) return null;
  const t = rawText(raw);
  if (t === null || t === '') return null;
  const isFree = c.col.cell.type === 'text' && !c.col.importOnly;
  if (isFree && identifierLikeContent(t)) return '(not shown: it may hold an identifier)';
  // Shown as read; every download neutralises formula-like text (problems-xlsx.ts).
  const s = t.trim();
  return s.length > MAX_VALUE ? `${s.slice(0, MAX_VALUE)}…` : s;
}

export class ProblemSink {
  readonly list: Problem[] = [];
  count = 0;
  errors = 0;
  warnings = 0;
  constructor(private readonly max: number) {}
  add(p: Problem): void {
    this.count++;
    if (p.severity === 'error') this.errors++;
    else this.warnings++;
    if (this.list.length < this.max) this.list.push(p);
  }
}

export interface ParsedRow {
  row: number;
  /** Field values read from the mapped cells (null = empty cell). */
  values: Record<string, unknown>;
  /** Raw cell of each mapped field, kept only while the row is checked (problem values). */
  raw: Record<string, unknown>;
  ok: boolean;
}

export function problemAt(sheet: string, row: number | null, c: MappedColumn | undefined, raw: unknown, message: string, hint: string, severity: Problem['severity'] = 'error'): Problem {
  return { sheet, row, column: c?.header ?? null, cell: c && row ? `${c.letter}${row}` : null, field: c?.col.key ?? null, value: shownValue(c, raw), message, hint, severity };
}

/** Reads the mapped cells of one row; a cell that cannot be read is a problem and the row is rejected. */
export function parseRow(sheet: string, row: number, values: readonly unknown[], cols: readonly MappedColumn[], opts: CellOptions, sink: ProblemSink): ParsedRow {
  const out: ParsedRow = { row, values: {}, raw: {}, ok: true };
  for (const c of cols) {
    const raw = values[c.index];
    const r = readCell(raw, c.col, opts);
    out.raw[c.col.key] = raw;
    if (r.ok) out.values[c.col.key] = r.value;
    else {
      out.ok = false;
      out.values[c.col.key] = null;
      sink.add(problemAt(sheet, row, c, raw, `${c.col.label}: ${r.message}`, r.hint));
    }
  }
  return out;
}

/** Hint for a field from its import column (what the cell should hold). */
export function hintFor(c: MappedColumn | undefined, schema?: z.ZodType): string {
  if (!c) {
    const meta = schema ? fieldMeta(schema) : undefined;
    return meta ? `check ${meta.label}` : 'check the row against the Data dictionary sheet of the template';
  }
  return `enter ${describeCell(c.col.cell, c.col.unit)} (see the Data dictionary sheet)`;
}

/**
 * zod issues as problems on the columns that hold the fields. `columnFor` maps a field path to
 * its mapped column (or undefined when the field is not in the file, e.g. a stored value).
 */
export function issuesToProblems(sheet: string, parsed: ParsedRow, issues: readonly z.core.$ZodIssue[], columnFor: (path: readonly PropertyKey[]) => MappedColumn | undefined, sink: ProblemSink, labelFor: (field: string) => string): void {
  for (const i of issues) {
    const c = columnFor(i.path);
    const field = String(i.path[0] ?? '');
    const label = c?.col.label ?? labelFor(field);
    sink.add(problemAt(sheet, parsed.row, c, c ? parsed.raw[c.col.key] : undefined, `${label}: ${i.message}`, c ? hintFor(c) : `the stored case has ${label} that conflicts with this row; correct the row or the case`));
  }
}
