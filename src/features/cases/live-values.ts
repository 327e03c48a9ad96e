/**
 * Values computed while the abstractor types, with the same pure functions the server stores
 * them with (analysis/clinical and shared/registry), so the form and the saved case agree:
 * BMI, ARISCAT points and class with the points per factor, length of stay, the follow-up
 * window, adherence per episode, days to first therapy and the completeness of the case.
 */
import { ariscatBreakdown, ariscatIncisionClass, checkAsaUrgency } from '../../../analysis/clinical/ariscat.js';
import { bmi } from '../../../analysis/clinical/body.js';
import { daysToFirstTherapy, followUpClosed, followUpWindow, lengthOfStay, postoperativeStay } from '../../../analysis/clinical/stay.js';
import { toStoredUnit, type MeasurementUnit } from '../../../shared/clinical/units.js';
import type { AriscatBreakdown } from '../../../shared/clinical/scores.js';
import { CASE_FIELDS, type CaseFieldName } from '../../../shared/registry/case.js';
import { caseCompleteness, type Completeness } from '../../../shared/registry/completeness.js';
import { episodeAdherence } from '../../../shared/registry/derived.js';
import { fieldMeta } from '../../../shared/registry/meta.js';
import type { CaseFormValues } from './form-model.js';

/** The case fields ARISCAT reads (Canet 2010), in the order of the published table. */
export const ARISCAT_FIELDS: readonly CaseFieldName[] = ['age', 'preopSpO2', 'respiratoryInfectionLastMonth', 'preopHaemoglobin', 'incisionSite', 'durationMinutes', 'urgency'];

export interface LiveAriscat {
  result: AriscatBreakdown | null;
  /** Labels of inputs still empty (the score is never computed with a missing input). */
  missing: string[];
  /** Why the inputs could not be scored (a value out of the function's range). */
  error: string | null;
}

export interface LiveValues {
  bmi: number | null;
  ariscat: LiveAriscat;
  asaWarnings: string[];
  lengthOfStayDays: number | null;
  postoperativeStayDays: number | null;
  followUpWindowEnd: string | null;
  followUpClosed: boolean | null;
  /** Per episode, sessions delivered / prescribed (null when not computable). */
  adherence: (number | null)[];
  daysToFirstTherapy: number | null;
  completeness: Completeness;
}

const label = (k: CaseFieldName) => fieldMeta(CASE_FIELDS[k])?.label ?? k;
const num = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const attempt = <T,>(f: () => T): T | null => {
  try {
    return f();
  } catch {
    return null;
  }
};

export function liveAriscat(v: Partial<CaseFormValues>): LiveAriscat {
  const missing = ARISCAT_FIELDS.filter((k) => v[k] == null || (typeof v[k] === 'number' && !Number.isFinite(v[k] as number))).map(label);
  if (missing.length) return { result: null, missing, error: null };
  try {
    const hb = v.preopHaemoglobin as { value: number; unit: MeasurementUnit };
    const result = ariscatBreakdown({
      age: v.age as number,
      preopSpO2: v.preopSpO2 as number,
      respiratoryInfectionLastMonth: v.respiratoryInfectionLastMonth as boolean,
      preopHemoglobin: toStoredUnit('haemoglobin', hb.value, hb.unit),
      incision: ariscatIncisionClass(v.incisionSite!),
      durationMinutes: v.durationMinutes as number,
      emergency: v.urgency === 'emergency',
    });
    return { result, missing: [], error: null };
  } catch (err) {
    return { result: null, missing: [], error: (err as Error).message };
  }
}

export function liveValues(v: CaseFormValues, today: string): LiveValues {
  const h = num(v.heightCm);
  const w = num(v.weightKg);
  const asa = v.asaClass && v.asaEmergency != null && v.urgency ? attempt(() => checkAsaUrgency({ asaClass: v.asaClass!, asaEmergency: v.asaEmergency!, urgency: v.urgency! })) : null;
  const sd = v.surgeryDate || null;
  const starts = (v.therapy ?? []).map((e) => num(e.startPostoperativeDay)).filter((d): d is number => d != null);
  return {
    bmi: h != null && w != null ? attempt(() => bmi(h, w)) : null,
    ariscat: liveAriscat(v),
    asaWarnings: asa ? [...asa.errors.map((e) => `${e.message}: ${e.hint}`), ...asa.warnings.map((x) => x.message)] : [],
    lengthOfStayDays: v.admissionDate && v.dischargeDate ? attempt(() => lengthOfStay(v.admissionDate!, v.dischargeDate!)) : null,
    postoperativeStayDays: sd && v.dischargeDate ? attempt(() => postoperativeStay(sd, v.dischargeDate!)) : null,
    followUpWindowEnd: sd ? attempt(() => followUpWindow(sd).end) : null,
    followUpClosed: sd ? attempt(() => followUpClosed(sd, today)) : null,
    adherence: (v.therapy ?? []).map((e) => episodeAdherence({ sessionsDelivered: num(e.sessionsDelivered), sessionsPrescribed: num(e.sessionsPrescribed) })),
    daysToFirstTherapy: attempt(() => daysToFirstTherapy(starts.map((d) => ({ startPostoperativeDay: d })))),
    completeness: caseCompleteness(
      v as unknown as Record<string, unknown>,
      (v.therapy ?? []).map((e, i) => ({ ...e, id: e.recordId ?? `new-${i + 1}` })),
      (v.outcomes ?? []).map((e, i) => ({ ...e, id: e.recordId ?? `new-${i + 1}` })),
    ),
  };
}

/** Today's date in the browser's calendar (YYYY-MM-DD); the server uses the network's zone. */
export function browserToday(now = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}`;
}
