/**
 * The variables a research export may contain, built from the data dictionary. Default-deny:
 * a registry field is offered only when the dictionary marks it exportable and it is not free
 * text, dates and references never leave as they are, and the only other variables are the
 * reviewed de-identified derivations listed here (each names the Safe Harbor rule it applies).
 * A field added to the registry later stays out until the dictionary marks it exportable.
 */
import { z } from 'zod';
import { PPC_EVENT_TYPES, PPC_EVENT_TYPE_LABELS, THERAPY_MODALITIES, THERAPY_MODALITY_LABELS, CLAVIEN_DINDO_GRADES } from '../clinical/codes.js';
import type { DictionaryEntry } from '../registry/dictionary.js';

const SAFE_HARBOR = 'HIPAA Safe Harbor, 45 CFR 164.514(b)(2)';

export const ExportVariableSchema = z.object({
  name: z.string(),
  label: z.string(),
  section: z.string(),
  type: z.string(),
  unit: z.string(),
  allowedValues: z.string(),
  definition: z.string(),
  /** What was done to the value before it left (empty when it leaves as recorded). */
  deidentification: z.string(),
  /** Where the value comes from, for the server's query builder. */
  source: z.discriminatedUnion('kind', [
    z.object({ kind: z.literal('case'), field: z.string() }),
    z.object({ kind: z.literal('derived'), rule: z.enum(['site', 'unit', 'surgeryPeriod', 'age', 'ageBand', 'daysFromSurgery']), field: z.string() }),
    z.object({ kind: z.literal('ppc'), type: z.string(), what: z.enum(['present', 'onsetDay']) }),
    z.object({ kind: z.literal('ppcWorstGrade') }),
    z.object({ kind: z.literal('therapy'), modality: z.string(), what: z.enum(['given', 'startDay', 'sessionsDelivered']) }),
  ]),
});
export type ExportVariable = z.infer<typeof ExportVariableSchema>;

/** The study id is always the first column; it is not chosen. */
export const STUDY_ID_VARIABLE = {
  name: 'studyId', label: 'Study id', section: 'registry', type: 'text', unit: '', allowedValues: 'S- and 10 characters',
  definition: 'A random id drawn for this export only; the same case has another id in another export.',
  deidentification: `replaces the registry case number and the keyed hash (${SAFE_HARBOR}(i)(R): no unique identifying number derived from the record)`,
} as const;

const camel = (s: string) => s.replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** Date fields that leave as days relative to the surgery date. */
const DAY_OFFSETS: Record<string, string> = {
  admissionDate: 'admissionDay', dischargeDate: 'dischargeDay', deathDate: 'deathDay', followUpCompletedOn: 'followUpDay',
};

/**
 * The export catalog for a dictionary (pure: the test passes a dictionary with an added field).
 * @param dictionary the registry's data dictionary (shared/registry/dictionary.ts buildDictionary())
 */
export function exportCatalog(dictionary: readonly DictionaryEntry[]): ExportVariable[] {
  const byName = new Map(dictionary.map((d) => [d.variable, d]));
  const ok = (v: string) => { const d = byName.get(v); return !!d && d.exportable && !d.freeText; };
  const present = (v: string) => { const d = byName.get(v); return !!d && !d.freeText; };
  const out: ExportVariable[] = [];

  // Reviewed derivations of identifying fields (the raw value never leaves).
  if (present('surgeryDate')) {
    out.push({ name: 'surgeryPeriod', label: 'Surgery year (or year-month in a limited set)', section: 'operation', type: 'text', unit: 'YYYY or YYYY-MM', allowedValues: '',
      definition: 'Year of the surgery date; in a limited data set under a data-use agreement, year and month.',
      deidentification: `date reduced to the year (${SAFE_HARBOR}(i)(C)); year-month only in a limited data set (45 CFR 164.514(e))`, source: { kind: 'derived', rule: 'surgeryPeriod', field: 'surgeryDate' } });
  }
  if (present('age')) {
    out.push({ name: 'age', label: 'Age', section: 'patient', type: 'whole number or "90 or older"', unit: 'years', allowedValues: '0–89; 90 or older',
      definition: 'Age in whole years on the day of surgery; every age over 89 is the single category "90 or older".',
      deidentification: `ages over 89 aggregated into "90 or older" (${SAFE_HARBOR}(i)(C))`, source: { kind: 'derived', rule: 'age', field: 'age' } });
    out.push({ name: 'ageBand', label: 'Age band', section: 'patient', type: 'code', unit: 'years', allowedValues: '0–9; 10–19; …; 80–89; 90 or older',
      definition: 'Ten-year age band (twenty years when the approver coarsened the export).',
      deidentification: `banded; 90 and over in one band (${SAFE_HARBOR}(i)(C))`, source: { kind: 'derived', rule: 'ageBand', field: 'age' } });
  }
  for (const [field, name] of Object.entries(DAY_OFFSETS)) {
    const d = byName.get(field);
    if (!d || d.freeText || !present('surgeryDate')) continue;
    out.push({ name, label: `${d.label}, as days from surgery`, section: d.section, type: 'whole number', unit: 'days', allowedValues: '0 = surgery day; negative = before surgery',
      definition: `${d.definition} Exported as days after the surgery date.`,
      deidentification: `date replaced by days relative to surgery (${SAFE_HARBOR}(i)(C))`, source: { kind: 'derived', rule: 'daysFromSurgery', field } });
  }
  out.push({ name: 'site', label: 'Site', section: 'registry', type: 'code', unit: '', allowedValues: 'Site A, Site B, … (or the site names when approved)',
    definition: 'Hospital of the case, as a code drawn for this export unless the approver allowed site names.',
    deidentification: `per-export code (${SAFE_HARBOR}(i)(B): no geographic unit smaller than a state)`, source: { kind: 'derived', rule: 'site', field: 'siteId' } });
  if (present('unitId')) {
    out.push({ name: 'unit', label: 'Unit', section: 'operation', type: 'code', unit: '', allowedValues: 'Unit A, Unit B, …',
      definition: 'Ward or unit after surgery, as a code drawn for this export (the same unit of two sites gets two codes).',
      deidentification: 'per-export code, never the unit name', source: { kind: 'derived', rule: 'unit', field: 'unitId' } });
  }

  // Case fields the dictionary marks exportable (never dates, references or free text).
  for (const d of dictionary) {
    if ((d.record !== 'case' && d.variable !== 'ariscatPoints') || !ok(d.variable)) continue;
    if (d.type === 'date' || d.type === 'reference' || d.type === 'text' || d.variable in DAY_OFFSETS || d.variable === 'age') continue;
    out.push({ name: d.variable, label: d.label, section: d.section, type: d.type, unit: d.unit, allowedValues: d.allowedValues, definition: d.definition, deidentification: '', source: { kind: 'case', field: d.variable } });
  }

  // Per-case summaries of outcome events, from event fields the dictionary marks exportable.
  if (ok('outcome.type')) {
    for (const type of PPC_EVENT_TYPES) {
      const base = `ppc${cap(camel(type))}`;
      out.push({ name: base, label: `${PPC_EVENT_TYPE_LABELS[type]}: any event`, section: 'outcomes', type: 'yes/no', unit: '', allowedValues: 'true; false',
        definition: `At least one current (not removed) ${PPC_EVENT_TYPE_LABELS[type].toLowerCase()} event.`, deidentification: '', source: { kind: 'ppc', type, what: 'present' } });
      if (ok('outcome.onsetPostoperativeDay')) {
        out.push({ name: `${base}OnsetDay`, label: `${PPC_EVENT_TYPE_LABELS[type]}: first onset`, section: 'outcomes', type: 'whole number', unit: 'post-operative day', allowedValues: '',
          definition: `Post-operative day of the first ${PPC_EVENT_TYPE_LABELS[type].toLowerCase()} event (empty when none).`, deidentification: '', source: { kind: 'ppc', type, what: 'onsetDay' } });
      }
    }
    if (ok('outcome.clavienDindo')) {
      out.push({ name: 'ppcWorstClavienDindo', label: 'Worst Clavien–Dindo grade of any event', section: 'outcomes', type: 'code', unit: '', allowedValues: CLAVIEN_DINDO_GRADES.join('; '),
        definition: 'Highest Clavien–Dindo grade among the current events (empty when none or ungraded).', deidentification: '', source: { kind: 'ppcWorstGrade' } });
    }
  }

  // Per-case summaries of therapy episodes, per modality.
  if (ok('therapy.modality')) {
    for (const modality of THERAPY_MODALITIES) {
      const base = `therapy${cap(camel(modality))}`;
      const label = THERAPY_MODALITY_LABELS[modality];
      out.push({ name: base, label: `${label}: given`, section: 'therapy', type: 'yes/no', unit: '', allowedValues: 'true; false',
        definition: `At least one current ${label} episode.`, deidentification: '', source: { kind: 'therapy', modality, what: 'given' } });
      if (ok('therapy.startPostoperativeDay')) {
        out.push({ name: `${base}StartDay`, label: `${label}: first day`, section: 'therapy', type: 'whole number', unit: 'post-operative day', allowedValues: '',
          definition: `Earliest post-operative day a ${label} episode started.`, deidentification: '', source: { kind: 'therapy', modality, what: 'startDay' } });
      }
      if (ok('therapy.sessionsDelivered')) {
        out.push({ name: `${base}Sessions`, label: `${label}: sessions delivered`, section: 'therapy', type: 'whole number', unit: 'sessions', allowedValues: '',
          definition: `Sessions delivered over all ${label} episodes.`, deidentification: '', source: { kind: 'therapy', modality, what: 'sessionsDelivered' } });
      }
    }
  }
  return out;
}

/** Variables an aggregate table may be broken down by (coded, few values). */
export const AGGREGATE_DIMENSIONS = ['site', 'surgeryPeriod', 'ageBand', 'sex', 'asaClass', 'procedureCategory', 'urgency', 'approach', 'anaesthesia', 'smokingStatus', 'ppcAtelectasis', 'ppcRespiratoryInfection', 'ppcRespiratoryFailure', 'died30d', 'readmitted30d'] as const;
