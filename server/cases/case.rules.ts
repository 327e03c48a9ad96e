/** Server-side rules of a case beyond its schema: ARISCAT, stored warnings, dates not in the future. */
import { ariscatIncisionClass, ariscatScore, checkAsaUrgency } from '../../analysis/clinical/ariscat.js';
import type { AriscatResult } from '../../shared/clinical/scores.js';
import { caseContradictions, type CaseFields, type Contradiction } from '../../shared/registry/case.js';
import type { RegistryWarning } from '../../shared/registry/record.js';
import { storedValue } from './case.repo.js';

/**
 * ARISCAT points and class (Canet J et al., Anesthesiology 2010;113:1338-50) with
 * analysis/clinical's `ariscatScore`; null while an input is missing (never scored as zero).
 */
export function computeAriscat(f: Partial<CaseFields>): AriscatResult | null {
  const hb = storedValue('preopHaemoglobin', f.preopHaemoglobin) as number | null;
  if (f.age == null || f.preopSpO2 == null || f.respiratoryInfectionLastMonth == null || hb == null || !f.incisionSite || f.durationMinutes == null || !f.urgency) return null;
  try {
    return ariscatScore({
      age: f.age,
      preopSpO2: f.preopSpO2,
      respiratoryInfectionLastMonth: f.respiratoryInfectionLastMonth,
      preopHemoglobin: hb,
      incision: ariscatIncisionClass(f.incisionSite),
      durationMinutes: f.durationMinutes,
      emergency: f.urgency === 'emergency',
    });
  } catch {
    return null;
  }
}

/** Warnings stored with the case: they do not block saving. */
export function caseWarnings(f: Partial<CaseFields>): RegistryWarning[] {
  const out: RegistryWarning[] = [];
  if (f.asaClass && f.asaEmergency != null && f.urgency) {
    for (const w of checkAsaUrgency({ asaClass: f.asaClass, asaEmergency: f.asaEmergency, urgency: f.urgency }).warnings) out.push({ path: w.path, code: 'asa-urgency', message: w.message });
  }
  return out;
}

const DATE_FIELDS = ['admissionDate', 'surgeryDate', 'dischargeDate', 'deathDate', 'followUpCompletedOn'] as const;

/** The schema's contradictions plus dates after today (in the network time zone). */
export function serverContradictions(f: Partial<CaseFields>, today: string): Contradiction[] {
  const out = caseContradictions(f);
  for (const d of DATE_FIELDS) {
    const v = f[d];
    if (v && v > today) out.push({ path: d, message: `the date ${v} is in the future (today is ${today}); check the year and month` });
  }
  return out;
}
