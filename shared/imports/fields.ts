/**
 * The columns a bulk import understands, per record kind, derived from the registry's own field
 * schemas (shared/registry): the same labels, units and code lists as the form and the data
 * dictionary. A few columns exist only in imports: the linking key local to the file, the
 * registry case number (to update an existing case), the site and unit codes, the hospital
 * identifier (hashed in memory, never stored) and the haemoglobin unit.
 */
import type { z } from 'zod';
import { CASE_FIELDS } from '../registry/case.js';
import { THERAPY_FIELDS } from '../registry/therapy.js';
import { OUTCOME_FIELDS } from '../registry/outcome.js';
import { fieldMeta, innerSchema } from '../registry/meta.js';

export const RECORD_KINDS = ['cases', 'therapy', 'outcomes'] as const;
export type RecordKind = (typeof RECORD_KINDS)[number];

/** Sheet names of the template (matched case-insensitively on upload). */
export const SHEET_NAMES: Record<RecordKind, string> = { cases: 'Cases', therapy: 'Therapy episodes', outcomes: 'Outcomes' };
/** Other names a sheet of each kind may carry (a hospital export renamed by hand). */
export const SHEET_ALIASES: Record<RecordKind, readonly string[]> = {
  cases: ['cases', 'case', 'surgical cases'],
  therapy: ['therapy episodes', 'therapy', 'therapy episode', 'lung-expansion therapy'],
  outcomes: ['outcomes', 'outcome', 'outcome events', 'complications'],
};
export const DICTIONARY_SHEET = 'Data dictionary';
export const LISTS_SHEET = 'Lists';
export const README_SHEET = 'Read me';

/** How a cell's content is read before the registry schema validates it. */
export type CellKind =
  | { type: 'text'; maxLength?: number }
  | { type: 'number'; integer: boolean }
  | { type: 'boolean' }
  | { type: 'date' }
  | { type: 'code'; codes: readonly string[]; labels: Readonly<Record<string, string>> }
  | { type: 'codes'; codes: readonly string[]; labels: Readonly<Record<string, string>> };

export interface ImportColumn {
  /** Field name (the registry variable, or an import-only key). */
  key: string;
  /** Header written in the template; matched case-insensitively on upload. */
  label: string;
  unit?: string;
  cell: CellKind;
  /** Needed on every row of this kind (the upload's mapping must include it). */
  required?: boolean;
  /** Never stored, logged or shown: hashed in memory. */
  identifier?: boolean;
  /** Import-only column (not a registry field). */
  importOnly?: boolean;
  note: string;
}

export const HB_UNITS = ['g/dL', 'g/L'] as const;

type AnySchema = z.ZodType;

/** Reads a cell kind from a registry field schema (its innermost type and dictionary metadata). */
export function cellKindOf(schema: AnySchema): CellKind {
  const inner = innerSchema(schema) as unknown as { def: { type: string; format?: string; entries?: Record<string, string>; element?: { def: { entries?: Record<string, string> } }; checks?: { _zod: { def: { check: string; maximum?: number; format?: string } } }[] } };
  const meta = fieldMeta(schema);
  const labels = meta?.valueLabels ?? {};
  const d = inner.def;
  if (d.type === 'boolean') return { type: 'boolean' };
  if (d.type === 'enum') return { type: 'code', codes: Object.values(d.entries ?? {}), labels };
  if (d.type === 'array') return { type: 'codes', codes: Object.values(d.element?.def.entries ?? {}), labels };
  if (d.type === 'number') {
    const integer = (d.checks ?? []).some((c) => c._zod.def.check === 'number_format' && String(c._zod.def.format).includes('int'));
    return { type: 'number', integer };
  }
  if (d.type === 'string' && d.format === 'date') return { type: 'date' };
  const max = (d.checks ?? []).find((c) => c._zod.def.check === 'max_length')?._zod.def.maximum;
  return { type: 'text', maxLength: max };
}

/** What a cell of this kind should hold, in words (template notes and problem hints). */
export function describeCell(cell: CellKind, unit?: string): string {
  switch (cell.type) {
    case 'boolean': return 'yes or no';
    case 'date': return 'date as YYYY-MM-DD (or an Excel date)';
    case 'number': return `${cell.integer ? 'whole number' : 'number'}${unit ? ` in ${unit}` : ''}`;
    case 'code': return `one of: ${cell.codes.join(', ')}`;
    case 'codes': return `one or more of (separated by ;): ${cell.codes.join(', ')}`;
    case 'text': return `text${cell.maxLength ? ` (up to ${cell.maxLength} characters)` : ''}`;
  }
}

function fromRegistry(key: string, schema: AnySchema, opts: { required?: boolean; label?: string } = {}): ImportColumn {
  const meta = fieldMeta(schema);
  if (!meta) throw new Error(`registry field ${key} has no dictionary metadata`);
  const cell = cellKindOf(schema);
  const parts = [meta.definition, describeCell(cell, meta.unit), meta.unit && cell.type !== 'number' && cell.type !== 'date' ? `unit: ${meta.unit}` : '', meta.freeText ? 'no names or record numbers in free text' : ''];
  return { key, label: opts.label ?? meta.label, unit: meta.unit, cell, required: opts.required, note: parts.filter(Boolean).join('. ') };
}

const LINK_KEY: ImportColumn = {
  key: 'caseKey', label: 'Case key (this file only)', cell: { type: 'text', maxLength: 40 }, importOnly: true,
  note: 'Any short label that ties therapy and outcome rows to a case row of this file (e.g. C1, C2). It is used while importing and never stored.',
};
const REGISTRY_NUMBER: ImportColumn = {
  key: 'registryNumber', label: 'Registry case number', cell: { type: 'text', maxLength: 40 }, importOnly: true,
  note: 'Leave empty for a new case. Filled in: the existing case with this number is updated (or skipped, as chosen at commit).',
};

/** Case sheet: import-only columns first, then the registry's case fields in form order. */
export const CASE_COLUMNS: readonly ImportColumn[] = [
  LINK_KEY,
  REGISTRY_NUMBER,
  { key: 'siteCode', label: 'Site code', cell: { type: 'text', maxLength: 20 }, importOnly: true, note: 'Site code (e.g. HBR). Empty: the site chosen for the upload. You may import only for sites you are assigned to.' },
  { key: 'unitCode', label: 'Unit code', cell: { type: 'text', maxLength: 20 }, importOnly: true, note: 'Code of the unit the patient went to after surgery (one of the site\u2019s units).' },
  { key: 'localIdentifier', label: 'Hospital identifier', cell: { type: 'text', maxLength: 64 }, importOnly: true, identifier: true,
    note: 'The hospital\u2019s own identifier, only to detect the same case entered twice: Alveolog keeps a keyed hash of it and never stores, logs or shows it.' },
  ...Object.entries(CASE_FIELDS)
    .filter(([k]) => k !== 'unitId' && k !== 'preopHaemoglobin')
    .map(([k, s]) => fromRegistry(k, s as AnySchema, { required: k === 'surgeryDate' })),
  { key: 'preopHaemoglobin', label: 'Pre-operative haemoglobin', unit: 'g/dL or g/L', cell: { type: 'number', integer: false }, note: 'Last haemoglobin before surgery, in the unit given in the next column (stored in g/dL).' },
  { key: 'preopHaemoglobinUnit', label: 'Haemoglobin unit', cell: { type: 'code', codes: HB_UNITS, labels: { 'g/dL': 'g/dL', 'g/L': 'g/L' } }, importOnly: true, note: 'g/dL or g/L (empty means g/dL).' },
];

const LINK_COLUMNS: readonly ImportColumn[] = [
  { ...LINK_KEY, note: 'The case key of the case row in this file this record belongs to; or leave empty and give the registry case number of an existing case.' },
  { ...REGISTRY_NUMBER, note: 'Registry case number of an existing case (when the case is not in this file).' },
];

export const THERAPY_COLUMNS: readonly ImportColumn[] = [
  ...LINK_COLUMNS,
  ...Object.entries(THERAPY_FIELDS).map(([k, s]) => fromRegistry(k, s as AnySchema, { required: k === 'modality' })),
];

export const OUTCOME_COLUMNS: readonly ImportColumn[] = [
  ...LINK_COLUMNS,
  ...Object.entries(OUTCOME_FIELDS)
    .filter(([k]) => k !== 'observations')
    .map(([k, s]) => fromRegistry(k, s as AnySchema, { required: k === 'type' || k === 'onsetPostoperativeDay' })),
];

export const IMPORT_COLUMNS: Record<RecordKind, readonly ImportColumn[]> = { cases: CASE_COLUMNS, therapy: THERAPY_COLUMNS, outcomes: OUTCOME_COLUMNS };

export function columnOf(kind: RecordKind, key: string): ImportColumn | undefined {
  return IMPORT_COLUMNS[kind].find((c) => c.key === key);
}

/** Which record kind a sheet name stands for, or null. */
export function kindOfSheet(name: string): RecordKind | null {
  const n = name.trim().toLowerCase();
  for (const k of RECORD_KINDS) if (SHEET_ALIASES[k].includes(n) || SHEET_NAMES[k].toLowerCase() === n) return k;
  return null;
}

const norm = (s: string) => s.normalize('NFKC').trim().toLowerCase().replace(/\s+/g, ' ');
const compact = (s: string) => norm(s).replace(/[^a-z0-9]/g, '');

/**
 * Automatic mapping of one header: the field name exactly or in any case, else the label in any
 * case (spacing and punctuation ignored, e.g. "surgery_date" = "Surgery date"). Null: map by hand.
 */
export function autoMapHeader(kind: RecordKind, header: string): string | null {
  const cols = IMPORT_COLUMNS[kind];
  const exact = cols.find((c) => c.key === header.trim());
  if (exact) return exact.key;
  const h = norm(header);
  const ci = cols.find((c) => c.key.toLowerCase() === h || norm(c.label) === h);
  if (ci) return ci.key;
  const hc = compact(header);
  if (!hc) return null;
  const loose = cols.find((c) => compact(c.key) === hc || compact(c.label) === hc || (c.unit && compact(`${c.label} (${c.unit})`) === hc));
  return loose?.key ?? null;
}
