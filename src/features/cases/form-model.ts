/**
 * The case form's model: its schema (built from the shared registry schemas and contradiction
 * rules, so the form checks exactly what the server checks), the conversion from a stored case
 * to form values, and the differences that decide what a save sends.
 */
import { z } from 'zod';
import { checkTherapyEpisode } from '../../../analysis/clinical/therapy-checks.js';
import { CASE_FIELDS, CASE_FIELD_NAMES, CaseFieldsSchema, LocalIdentifierSchema, caseContradictions, type CaseFieldName } from '../../../shared/registry/case.js';
import { OutcomeEventFieldsSchema, OUTCOME_FIELDS, outcomeContradictions } from '../../../shared/registry/outcome.js';
import type { Case } from '../../../shared/registry/record.js';
import { ReasonSchema } from '../../../shared/registry/text.js';
import { THERAPY_FIELDS, TherapyEpisodeFieldsSchema, therapyContradictions, type TherapyFieldName } from '../../../shared/registry/therapy.js';

const issuePath = (p: string) => p.split('.').map((s) => (/^\d+$/.test(s) ? Number(s) : s));

/** One episode in the form: the shared episode fields plus the stored record's id (absent while new). */
export const EpisodeFormSchema = TherapyEpisodeFieldsSchema.extend({ recordId: z.string().optional() }).superRefine((e, ctx) => {
  const { recordId: _id, ...fields } = e;
  for (const x of therapyContradictions(fields)) ctx.addIssue({ code: 'custom', path: issuePath(x.path), message: x.message });
  // The same per-modality check the server applies (fields that do not apply, impossible values).
  try {
    const checked = checkTherapyEpisode(fields as Parameters<typeof checkTherapyEpisode>[0]);
    for (const x of checked.errors) ctx.addIssue({ code: 'custom', path: issuePath(x.path), message: `${x.message}; ${x.hint}` });
  } catch (err) {
    ctx.addIssue({ code: 'custom', path: ['modality'], message: (err as Error).message });
  }
});
export type EpisodeForm = z.infer<typeof EpisodeFormSchema>;

export const EventFormSchema = OutcomeEventFieldsSchema.extend({ recordId: z.string().optional() }).superRefine((e, ctx) => {
  for (const x of outcomeContradictions(e)) ctx.addIssue({ code: 'custom', path: issuePath(x.path), message: x.message });
});
export type EventForm = z.input<typeof EventFormSchema>;

/** The whole form. `siteId` and the surgery date are needed to number a new case (as in CaseCreateSchema). */
export const CaseFormSchema = CaseFieldsSchema.extend({
  siteId: z.uuid('choose the site'),
  surgeryDate: CASE_FIELDS.surgeryDate,
  localIdentifier: LocalIdentifierSchema.nullable().optional(),
  therapy: z.array(EpisodeFormSchema).max(50),
  outcomes: z.array(EventFormSchema).max(50),
  amendmentReason: ReasonSchema.nullable().optional(),
}).superRefine((c, ctx) => {
  for (const x of caseContradictions(c)) ctx.addIssue({ code: 'custom', path: issuePath(x.path), message: x.message });
});
export type CaseFormValues = z.input<typeof CaseFormSchema>;
export type CaseFormOutput = z.output<typeof CaseFormSchema>;

const THERAPY_NAMES = Object.keys(THERAPY_FIELDS) as TherapyFieldName[];
const OUTCOME_NAMES = Object.keys(OUTCOME_FIELDS) as (keyof typeof OUTCOME_FIELDS)[];

/** Empty form values for a new case. */
export function emptyForm(siteId = ''): CaseFormValues {
  const v: Record<string, unknown> = Object.fromEntries(CASE_FIELD_NAMES.map((k) => [k, null]));
  return { ...(v as CaseFormValues), siteId, surgeryDate: '', localIdentifier: null, therapy: [], outcomes: [], amendmentReason: null };
}

/** Stored haemoglobin may come back as `{ value, unit }` or as the stored g/dL number. */
function haemoglobin(v: unknown): { value: number; unit: 'g/dL' | 'g/L' } | null {
  if (v == null) return null;
  if (typeof v === 'number') return { value: v, unit: 'g/dL' };
  return v as { value: number; unit: 'g/dL' | 'g/L' };
}

export function episodeToForm(e: Case['therapy'][number]): EpisodeForm {
  const out: Record<string, unknown> = { recordId: e.id };
  for (const k of THERAPY_NAMES) out[k] = (e as Record<string, unknown>)[k] ?? null;
  return out as EpisodeForm;
}

export function eventToForm(e: Case['outcomes'][number]): EventForm {
  const out: Record<string, unknown> = { recordId: e.id };
  for (const k of OUTCOME_NAMES) out[k] = (e as Record<string, unknown>)[k] ?? (k === 'observations' ? [] : null);
  return out as EventForm;
}

/** Form values of a stored case. */
export function caseToForm(c: Case): CaseFormValues {
  const v: Record<string, unknown> = {};
  for (const k of CASE_FIELD_NAMES) v[k] = (c as Record<string, unknown>)[k] ?? null;
  v.preopHaemoglobin = haemoglobin((c as Record<string, unknown>).preopHaemoglobin ?? (c as Record<string, unknown>).preopHaemoglobinGdl);
  return { ...(v as CaseFormValues), siteId: c.siteId, surgeryDate: c.surgeryDate ?? '', localIdentifier: null, therapy: c.therapy.map(episodeToForm), outcomes: c.outcomes.map(eventToForm), amendmentReason: null };
}

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/** Case fields that differ between two sets of values (what a PATCH sends). */
export function changedCaseFields(now: Partial<CaseFormValues>, base: Partial<CaseFormValues>): CaseFieldName[] {
  return CASE_FIELD_NAMES.filter((k) => !same(now[k], base[k]));
}

/** Fields of one record that differ (what a record PATCH sends). */
export function changedRecordFields<T extends Record<string, unknown>>(now: T, base: T | undefined, names: readonly string[]): string[] {
  return names.filter((k) => !same(now[k], base?.[k]));
}

export const therapyFieldNames = THERAPY_NAMES;
export const outcomeFieldNames = OUTCOME_NAMES as string[];

/** The case fields to send when creating: only those with a value (the rest stay empty). */
export function createBody(v: CaseFormOutput) {
  const body: Record<string, unknown> = { siteId: v.siteId, surgeryDate: v.surgeryDate };
  for (const k of CASE_FIELD_NAMES) if (v[k] != null) body[k] = v[k];
  if (v.localIdentifier) body.localIdentifier = v.localIdentifier;
  return body;
}

/** Only the named fields of a record, nulls kept (a cleared value is sent as null). */
export function pick(values: Record<string, unknown>, names: readonly string[]): Record<string, unknown> {
  return Object.fromEntries(names.map((k) => [k, values[k] ?? null]));
}

export interface FieldConflict {
  /** Path in the form: a case field, or `therapy.<index>.<field>` / `outcomes.<index>.<field>`. */
  path: string;
  label: string;
  mine: unknown;
  theirs: unknown;
}

/**
 * After a 409: the fields the user changed that someone else also changed since the version
 * the user read. Fields only the other person changed are taken from their version silently;
 * fields only the user changed are kept.
 */
export function findConflicts(mine: CaseFormValues, base: CaseFormValues, theirs: CaseFormValues): FieldConflict[] {
  const out: FieldConflict[] = [];
  for (const k of CASE_FIELD_NAMES) {
    if (!same(mine[k], base[k]) && !same(theirs[k], base[k]) && !same(mine[k], theirs[k])) {
      const meta = CASE_FIELDS[k].meta() as { label?: string; unit?: string } | undefined;
      const unit = meta?.unit && !meta.unit.startsWith('date') ? ` (${meta.unit})` : '';
      out.push({ path: k, label: `${meta?.label ?? k}${unit}`, mine: mine[k], theirs: theirs[k] });
    }
  }
  const records = (list: 'therapy' | 'outcomes', names: readonly string[]) => {
    mine[list].forEach((r, i) => {
      const id = (r as { recordId?: string }).recordId;
      if (!id) return;
      const b = (base[list] as { recordId?: string }[]).find((x) => x.recordId === id) as Record<string, unknown> | undefined;
      const t = (theirs[list] as { recordId?: string }[]).find((x) => x.recordId === id) as Record<string, unknown> | undefined;
      for (const f of names) {
        const m = (r as Record<string, unknown>)[f];
        if (!same(m, b?.[f]) && !same(t?.[f], b?.[f]) && !same(m, t?.[f])) {
          out.push({ path: `${list}.${i}.${f}`, label: `${list === 'therapy' ? 'Episode' : 'Event'} ${i + 1}: ${f}`, mine: m, theirs: t ? t[f] : '(removed)' });
        }
      }
    });
  };
  records('therapy', THERAPY_NAMES);
  records('outcomes', OUTCOME_NAMES);
  return out;
}

/**
 * Merges after a 409: start from their version, re-apply every change the user made since
 * `base`, then for conflicting fields apply the user's choice. New (unsaved) records are kept.
 */
export function mergeAfterConflict(mine: CaseFormValues, base: CaseFormValues, theirs: CaseFormValues, takeTheirs: ReadonlySet<string>): CaseFormValues {
  const out: CaseFormValues = { ...theirs, siteId: mine.siteId, localIdentifier: mine.localIdentifier, amendmentReason: mine.amendmentReason };
  const o = out as Record<string, unknown>;
  for (const k of CASE_FIELD_NAMES) if (!same(mine[k], base[k]) && !takeTheirs.has(k)) o[k] = mine[k];
  const mergeList = (list: 'therapy' | 'outcomes') => {
    const theirsList = theirs[list] as Record<string, unknown>[];
    const baseList = base[list] as Record<string, unknown>[];
    const merged = theirsList.map((t) => {
      const mi = (mine[list] as Record<string, unknown>[]).findIndex((m) => m.recordId === t.recordId);
      if (mi < 0) return t;
      const m = (mine[list] as Record<string, unknown>[])[mi];
      const b = baseList.find((x) => x.recordId === t.recordId);
      const r: Record<string, unknown> = { ...t };
      for (const f of Object.keys(m)) if (f !== 'recordId' && !same(m[f], b?.[f]) && !takeTheirs.has(`${list}.${mi}.${f}`)) r[f] = m[f];
      return r;
    });
    const fresh = (mine[list] as Record<string, unknown>[]).filter((m) => !m.recordId);
    (out as Record<string, unknown>)[list] = [...merged, ...fresh];
  };
  mergeList('therapy');
  mergeList('outcomes');
  return out;
}

/** Shows a form value in words for the conflict table and the audit trail. */
export function showValue(v: unknown): string {
  if (v === null || v === undefined || v === '') return '(empty)';
  if (v === true) return 'Yes';
  if (v === false) return 'No';
  if (typeof v === 'object' && v && 'value' in v && 'unit' in v) return `${String((v as { value: unknown }).value)} ${String((v as { unit: unknown }).unit)}`;
  if (typeof v === 'object') return JSON.stringify(v);
  return String(v);
}
