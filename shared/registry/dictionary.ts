/**
 * The data dictionary, generated from the same zod schemas the form and the server validate
 * with (their types, ranges and code lists), the metadata attached to each field (label, unit,
 * definition, source, exportable) and the completeness rules (required flags).
 */
import { z } from 'zod';
import { QUANTITIES, UNIT_LABELS } from '../clinical/units.js';
import { CASE_FIELDS, type CaseFieldName } from './case.js';
import { EPISODE_REQUIRED_FIELDS, EVENT_REQUIRED_FIELDS, requirementNote, requirementOf } from './completeness.js';
import { DERIVED_MEASURES } from './derived.js';
import { DictionarySectionSchema, fieldMeta, innerSchema, type FieldMeta } from './meta.js';
import { OUTCOME_FIELDS } from './outcome.js';
import { FREE_TEXT_REMINDER } from './text.js';
import { THERAPY_FIELDS } from './therapy.js';

export const DictionaryEntrySchema = z.object({
  variable: z.string(),
  record: z.enum(['case', 'therapy episode', 'outcome event', 'derived']),
  section: DictionarySectionSchema,
  label: z.string(),
  type: z.string(),
  unit: z.string(),
  allowedValues: z.string(),
  range: z.string(),
  required: z.enum(['required', 'conditional', 'optional', 'derived']),
  requirementNote: z.string(),
  definition: z.string(),
  source: z.string(),
  exportable: z.boolean(),
  freeText: z.boolean(),
});
export type DictionaryEntry = z.infer<typeof DictionaryEntrySchema>;

export const DICTIONARY_COLUMNS = DictionaryEntrySchema.keyof().options;

type Json = { type?: string; format?: string; enum?: unknown[]; minimum?: number; maximum?: number; maxLength?: number; items?: Json; anyOf?: Json[] };

function describeType(schema: z.ZodType, meta: FieldMeta): { type: string; allowed: string; range: string } {
  const inner = innerSchema(schema);
  if (meta.enteredUnits && meta.label.toLowerCase().includes('haemoglobin')) {
    const q = QUANTITIES.haemoglobin;
    return { type: 'measurement (value + unit)', allowed: `units: ${q.accepted.map((u) => UNIT_LABELS[u]).join(', ')}`, range: `${q.possible.min}–${q.possible.max} ${UNIT_LABELS[q.stored]} (possible)` };
  }
  let js: Json;
  try {
    js = z.toJSONSchema(inner, { unrepresentable: 'any', io: 'input' }) as Json;
  } catch {
    js = {};
  }
  const labels = meta.valueLabels;
  if (js.enum) return { type: 'code', allowed: js.enum.map((v) => (labels?.[String(v)] ? `${String(v)} = ${labels[String(v)]}` : String(v))).join('; '), range: '' };
  if (js.type === 'array') {
    if (js.items?.enum) return { type: 'list of codes', allowed: js.items.enum.map((v) => (labels?.[String(v)] ? `${String(v)} = ${labels[String(v)]}` : String(v))).join('; '), range: '' };
    return { type: 'list of observations', allowed: 'see the observation kinds', range: '' };
  }
  const bounds = (j: Json) => (j.minimum !== undefined || j.maximum !== undefined ? `${j.minimum ?? ''}–${j.maximum ?? ''}${meta.unit ? ` ${meta.unit}` : ''}` : '');
  if (js.type === 'integer') return { type: 'whole number', allowed: '', range: bounds(js) };
  if (js.type === 'number') return { type: 'number', allowed: '', range: bounds(js) };
  if (js.type === 'boolean') return { type: 'yes/no', allowed: 'true; false', range: '' };
  if (js.type === 'string' && js.format === 'date') return { type: 'date', allowed: 'YYYY-MM-DD', range: 'from 2000-01-01' };
  if (js.type === 'string' && js.format === 'uuid') return { type: 'reference', allowed: 'an id', range: '' };
  if (js.type === 'string') return { type: 'text', allowed: '', range: js.maxLength ? `up to ${js.maxLength} characters` : '' };
  return { type: 'value', allowed: '', range: '' };
}

function entry(variable: string, record: DictionaryEntry['record'], schema: z.ZodType, required: DictionaryEntry['required'], note: string): DictionaryEntry {
  const meta = fieldMeta(schema);
  if (!meta) throw new Error(`registry field ${variable} has no dictionary metadata`);
  const t = describeType(schema, meta);
  return {
    variable,
    record,
    section: meta.section,
    label: meta.label,
    type: t.type,
    unit: meta.unit ?? '',
    allowedValues: t.allowed,
    range: t.range,
    required,
    requirementNote: meta.freeText ? [note, FREE_TEXT_REMINDER].filter(Boolean).join(' ') : note,
    definition: meta.definition,
    source: meta.source ?? '',
    exportable: meta.exportable ?? false,
    freeText: meta.freeText ?? false,
  };
}

/** Every variable of the registry, in form order. */
export function buildDictionary(): DictionaryEntry[] {
  const out: DictionaryEntry[] = [];
  for (const [name, schema] of Object.entries(CASE_FIELDS) as [CaseFieldName, z.ZodType][]) {
    out.push(entry(name, 'case', schema, requirementOf(name), requirementNote(name)));
  }
  for (const [name, schema] of Object.entries(THERAPY_FIELDS) as [string, z.ZodType][]) {
    const req = (EPISODE_REQUIRED_FIELDS as readonly string[]).includes(name);
    out.push(entry(`therapy.${name}`, 'therapy episode', schema, req ? 'required' : 'optional', req ? 'required for every episode' : name === 'deliveredAbovePrescribedReason' ? 'required when more sessions were delivered than prescribed' : ''));
  }
  for (const [name, schema] of Object.entries(OUTCOME_FIELDS) as [string, z.ZodType][]) {
    const req = (EVENT_REQUIRED_FIELDS as readonly string[]).includes(name);
    out.push(entry(`outcome.${name}`, 'outcome event', schema, req ? 'required' : 'optional', req ? 'required for every event' : ''));
  }
  for (const d of DERIVED_MEASURES) {
    out.push({
      variable: d.variable, record: 'derived', section: d.variable === 'countsInAnalysis' || d.variable === 'complete' ? 'registry' : d.variable.includes('Therapy') || d.variable === 'adherence' ? 'therapy' : d.variable.includes('Stay') || d.variable.includes('followUp') || d.variable === 'patientDays' ? 'follow-up' : d.variable === 'surveillanceMonth' ? 'operation' : 'outcomes',
      label: d.label, type: d.unit === 'days' ? 'whole number' : d.unit === 'date' ? 'date' : d.unit === 'fraction' ? 'number' : d.unit === 'YYYY-MM' ? 'month' : 'yes/no',
      unit: d.unit, allowedValues: '', range: '', required: 'derived', requirementNote: `computed (${d.view})`, definition: d.definition, source: d.source, exportable: false, freeText: false,
    });
  }
  out.push({
    variable: 'ariscatPoints', record: 'derived', section: 'patient', label: 'ARISCAT points and risk class', type: 'whole number', unit: 'points', allowedValues: 'low < 26; intermediate 26–44; high ≥ 45', range: '0–123',
    required: 'derived', requirementNote: 'computed from age, SpO2, respiratory infection, haemoglobin, incision, duration and urgency; empty while an input is missing', definition: 'ARISCAT pre-operative risk of post-operative pulmonary complications.', source: 'Canet J et al., Anesthesiology 2010;113:1338-50', exportable: true, freeText: false,
  });
  return out;
}

/** CSV text of the dictionary (RFC 4180 quoting; a UTF-8 BOM so spreadsheet programs read the units). */
export function dictionaryCsv(entries: readonly DictionaryEntry[]): string {
  const q = (v: unknown) => {
    const s = String(v ?? '');
    return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  const lines = [DICTIONARY_COLUMNS.join(','), ...entries.map((e) => DICTIONARY_COLUMNS.map((c) => q(e[c])).join(','))];
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}
