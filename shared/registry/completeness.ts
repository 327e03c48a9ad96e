/**
 * Completeness: which fields a case needs before it can be marked complete, per section
 * (patient, operation, therapy, outcomes, follow-up). The same rules drive the form's
 * "missing" list, the data dictionary's required flags and the SQL view `case_completeness`
 * that worklists, cohorts, month close and data quality reuse (server/registry/completeness-sql.ts
 * generates its SQL from these rules; a test checks the two agree).
 */
import { CASE_FIELDS, type CaseFieldName, type CaseFields } from './case.js';
import type { DictionarySection } from './meta.js';
import { fieldMeta } from './meta.js';

export type CompletenessSection = Exclude<DictionarySection, 'registry'>;
export const COMPLETENESS_SECTIONS: readonly CompletenessSection[] = ['patient', 'operation', 'therapy', 'outcomes', 'follow-up'];

export interface CaseFieldRule {
  field: CaseFieldName;
  /** Only required when another field has this value. */
  when?: { field: CaseFieldName; equals: boolean | string };
  /** The answer must be exactly this (e.g. "reviewed" must be yes). */
  mustBe?: true;
}

/** Rules for an eligible case (or one whose eligibility is not yet answered). */
export const ELIGIBLE_CASE_RULES: readonly CaseFieldRule[] = [
  { field: 'eligible' },
  { field: 'admissionDate' },
  { field: 'age' },
  { field: 'sex' },
  { field: 'heightCm' },
  { field: 'weightKg' },
  { field: 'asaClass' },
  { field: 'asaEmergency' },
  { field: 'smokingStatus' },
  { field: 'copd' },
  { field: 'obstructiveSleepApnoea' },
  { field: 'heartFailure' },
  { field: 'preopSpO2' },
  { field: 'preopHaemoglobin' },
  { field: 'respiratoryInfectionLastMonth' },
  { field: 'functionalStatus' },
  { field: 'surgeryDate' },
  { field: 'procedureCategory' },
  { field: 'incisionSite' },
  { field: 'approach' },
  { field: 'urgency' },
  { field: 'anaesthesia' },
  { field: 'durationMinutes' },
  { field: 'therapyGiven' },
  { field: 'complicationsReviewed', mustBe: true },
  { field: 'dischargeDate' },
  { field: 'icuDays' },
  { field: 'ventilatorDays' },
  { field: 'readmitted30d' },
  { field: 'readmissionCause', when: { field: 'readmitted30d', equals: true } },
  { field: 'died30d' },
  { field: 'deathDate', when: { field: 'died30d', equals: true } },
  { field: 'followUpCompletedOn' },
];

/** A case outside the surveillance population needs only its exclusion recorded. */
export const EXCLUDED_CASE_RULES: readonly CaseFieldRule[] = [{ field: 'eligible' }, { field: 'exclusionReason' }, { field: 'surgeryDate' }];

/** Each (not removed) therapy episode needs these. */
export const EPISODE_REQUIRED_FIELDS = ['modality', 'startPostoperativeDay', 'sessionsPrescribed', 'sessionsDelivered'] as const;
/** Each (not removed) outcome event needs these. */
export const EVENT_REQUIRED_FIELDS = ['type', 'onsetPostoperativeDay', 'clavienDindo'] as const;

export interface MissingItem {
  section: CompletenessSection;
  /** Field path: a case field, `therapy.<episodeId>.<field>`, `outcomes.<eventId>.<field>`, or `therapy.episodes`. */
  field: string;
  message: string;
}

export interface Completeness {
  complete: boolean;
  missing: MissingItem[];
  /** Missing items per section (0 = the section is complete). */
  sections: Record<CompletenessSection, number>;
}

type Row = Record<string, unknown>;
const empty = (v: unknown) => v === null || v === undefined || v === '';

const metaCache = new Map<CaseFieldName, { section: CompletenessSection; label: string }>();
/** Section and label of a case field (read once from the schema's metadata). */
function metaOf(field: CaseFieldName): { section: CompletenessSection; label: string } {
  let m = metaCache.get(field);
  if (!m) {
    const meta = fieldMeta(CASE_FIELDS[field]);
    m = { section: meta?.section && meta.section !== 'registry' ? meta.section : 'patient', label: meta?.label ?? field };
    metaCache.set(field, m);
  }
  return m;
}
const sectionOf = (field: CaseFieldName) => metaOf(field).section;

/** Which case-field rules apply to a case (eligible, not yet answered, or excluded). */
export function rulesFor(c: Pick<CaseFields, 'eligible'>): readonly CaseFieldRule[] {
  return c.eligible === false ? EXCLUDED_CASE_RULES : ELIGIBLE_CASE_RULES;
}

/**
 * The completeness of a case from its fields and its current (not removed) episodes and events.
 * @example caseCompleteness({ eligible: false, exclusionReason: 'day case', surgeryDate: '2025-01-02' }, [], []).complete // true
 */
export function caseCompleteness(c: Partial<CaseFields> | Row, episodes: readonly Row[], events: readonly Row[]): Completeness {
  const rec = c as Row;
  const missing: MissingItem[] = [];
  const eligible = rec.eligible as boolean | null | undefined;
  for (const r of rulesFor({ eligible })) {
    if (r.when && rec[r.when.field] !== r.when.equals) continue;
    const v = rec[r.field];
    const label = metaOf(r.field).label;
    if (empty(v)) missing.push({ section: sectionOf(r.field), field: r.field, message: `${label} is missing` });
    else if (r.mustBe === true && v !== true) missing.push({ section: sectionOf(r.field), field: r.field, message: `${label} is not yet done` });
  }
  if (eligible !== false) {
    if (rec.therapyGiven === true && episodes.length === 0) {
      missing.push({ section: 'therapy', field: 'therapy.episodes', message: 'therapy was given but no episode is recorded' });
    }
    if (rec.therapyGiven === false && episodes.length > 0) {
      missing.push({ section: 'therapy', field: 'therapyGiven', message: 'episodes are recorded but "therapy given" is no' });
    }
    for (const e of episodes) {
      for (const f of EPISODE_REQUIRED_FIELDS) {
        if (empty(e[f])) missing.push({ section: 'therapy', field: `therapy.${String(e.id)}.${f}`, message: `an episode has no ${f}` });
      }
    }
    for (const e of events) {
      for (const f of EVENT_REQUIRED_FIELDS) {
        if (empty(e[f])) missing.push({ section: 'outcomes', field: `outcomes.${String(e.id)}.${f}`, message: `an outcome event has no ${f}` });
      }
    }
  }
  const sections = Object.fromEntries(COMPLETENESS_SECTIONS.map((s) => [s, missing.filter((m) => m.section === s).length])) as Record<CompletenessSection, number>;
  return { complete: missing.length === 0, missing, sections };
}

/** How the dictionary states a field's requirement. */
export function requirementOf(field: CaseFieldName): 'required' | 'conditional' | 'optional' {
  const r = ELIGIBLE_CASE_RULES.find((x) => x.field === field) ?? EXCLUDED_CASE_RULES.find((x) => x.field === field);
  if (!r) return 'optional';
  if (r.when || !ELIGIBLE_CASE_RULES.includes(r)) return 'conditional';
  return 'required';
}

export function requirementNote(field: CaseFieldName): string {
  const r = ELIGIBLE_CASE_RULES.find((x) => x.field === field);
  if (r?.when) return `required when ${r.when.field} is ${String(r.when.equals)}`;
  if (!r && EXCLUDED_CASE_RULES.some((x) => x.field === field)) return 'required when the case is not eligible';
  if (r?.mustBe) return 'must be yes before the case is complete';
  if (r) return 'required for an eligible case';
  return '';
}
