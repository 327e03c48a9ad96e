/**
 * ARISCAT pre-operative risk of post-operative pulmonary complications.
 *
 * Definition: Canet J, Gallart L, Gomar C, et al. Prediction of postoperative pulmonary
 * complications in a population-based surgical cohort. Anesthesiology 2010;113:1338-50
 * (the ARISCAT score; version as published, range 0–123).
 *
 * Method: sum of seven factor points, read as half-open intervals so that fractional inputs
 * have exactly one class:
 * - age (years): ≤ 50 → 0; > 50 and ≤ 80 → 3; > 80 → 16
 * - pre-operative SpO2 on room air (%): ≥ 96 → 0; ≥ 91 and < 96 → 8; < 91 → 24
 * - respiratory infection in the last month → 17
 * - pre-operative haemoglobin ≤ 10 g/dL → 11
 * - incision: peripheral 0, upper abdominal 15, intrathoracic 24
 * - duration (minutes): ≤ 120 → 0; > 120 and ≤ 180 → 16; > 180 → 23
 * - emergency procedure → 8
 * Risk class: low < 26, intermediate 26–44, high ≥ 45.
 */
import {
  ARISCAT_INCISIONS,
  ASA_CLASSES,
  INCISION_SITES,
  INCISION_SITE_TO_ARISCAT,
  URGENCIES,
  type AriscatIncision,
  type AsaClass,
  type IncisionSite,
  type Urgency,
} from '../../shared/clinical/codes.js';
import type { ConsistencyResult } from '../../shared/clinical/checks.js';
import type { AriscatBreakdown, AriscatInput, AriscatResult, AriscatRiskClass } from '../../shared/clinical/scores.js';
import { requireBoolean, requireNumber, requireObject, requireOneOf } from './require.js';

export const ARISCAT_SOURCE = 'Canet J et al., Anesthesiology 2010;113:1338-50';

export const ARISCAT_INCISION_POINTS: Readonly<Record<AriscatIncision, number>> = {
  peripheral: 0,
  'upper-abdominal': 15,
  intrathoracic: 24,
};

/** Risk class from points: low < 26, intermediate 26–44, high ≥ 45 (Canet 2010). */
export function ariscatRiskClass(points: number): AriscatRiskClass {
  requireNumber('ariscatRiskClass', 'points', points, { min: 0, max: 123 });
  if (points < 26) return 'low';
  if (points < 45) return 'intermediate';
  return 'high';
}

/**
 * ARISCAT points per factor, total and risk class (see the module comment for the method).
 *
 * @param input.age years, 0–130 (fractions allowed)
 * @param input.preopSpO2 %, 0–100, on room air
 * @param input.respiratoryInfectionLastMonth boolean
 * @param input.preopHemoglobin g/dL, above 0 and at most 25 (a larger value is probably g/L)
 * @param input.incision 'peripheral' | 'upper-abdominal' | 'intrathoracic' (map a registry
 *   incision site with `ariscatIncisionClass`)
 * @param input.durationMinutes minutes, 0–2880
 * @param input.emergency boolean, from the case's urgency
 * @throws AnalysisInputError for a missing, non-finite or impossible input (never scores it 0)
 * @example ariscatBreakdown({ age: 65, preopSpO2: 94, respiratoryInfectionLastMonth: false,
 *   preopHemoglobin: 13, incision: 'upper-abdominal', durationMinutes: 150, emergency: false })
 *   // points 3 + 8 + 15 + 16 = 42, 'intermediate'
 */
export function ariscatBreakdown(input: AriscatInput): AriscatBreakdown {
  const fn = 'ariscatScore';
  requireObject(fn, 'input', input);
  const age = requireNumber(fn, 'age', input.age, { min: 0, max: 130, unit: 'years' });
  const spo2 = requireNumber(fn, 'preopSpO2', input.preopSpO2, { min: 0, max: 100, unit: '%' });
  const infection = requireBoolean(fn, 'respiratoryInfectionLastMonth', input.respiratoryInfectionLastMonth);
  const hb = requireNumber(fn, 'preopHemoglobin', input.preopHemoglobin, {
    min: Number.MIN_VALUE,
    max: 25,
    unit: 'g/dL',
    fix: 'a value above 25 is probably in g/L: divide by 10',
  });
  const incision = requireOneOf(fn, 'incision', input.incision, ARISCAT_INCISIONS);
  const duration = requireNumber(fn, 'durationMinutes', input.durationMinutes, { min: 0, max: 2880, unit: 'min' });
  const emergency = requireBoolean(fn, 'emergency', input.emergency);

  const components = {
    age: age <= 50 ? 0 : age <= 80 ? 3 : 16,
    preopSpO2: spo2 >= 96 ? 0 : spo2 >= 91 ? 8 : 24,
    respiratoryInfectionLastMonth: infection ? 17 : 0,
    preopHemoglobin: hb <= 10 ? 11 : 0,
    incision: ARISCAT_INCISION_POINTS[incision],
    durationMinutes: duration <= 120 ? 0 : duration <= 180 ? 16 : 23,
    emergency: emergency ? 8 : 0,
  };
  const points = Object.values(components).reduce((a, b) => a + b, 0);
  return { points, riskClass: ariscatRiskClass(points), components };
}

/**
 * ARISCAT score: `{ points, riskClass }` (Canet J et al., Anesthesiology 2010;113:1338-50).
 * Same inputs, limits and errors as `ariscatBreakdown`.
 * @example ariscatScore({ age: 81, preopSpO2: 90, respiratoryInfectionLastMonth: true,
 *   preopHemoglobin: 10, incision: 'intrathoracic', durationMinutes: 181, emergency: true })
 *   // { points: 123, riskClass: 'high' }
 */
export function ariscatScore(input: AriscatInput): AriscatResult {
  const { points, riskClass } = ariscatBreakdown(input);
  return { points, riskClass };
}

/**
 * The ARISCAT incision class of a registry incision site (explicit table
 * `INCISION_SITE_TO_ARISCAT`: lower abdominal and every site outside the upper abdomen and
 * the thorax are "peripheral" in ARISCAT).
 * @throws AnalysisInputError for an unknown incision site
 */
export function ariscatIncisionClass(incisionSite: IncisionSite): AriscatIncision {
  const site = requireOneOf('ariscatIncisionClass', 'incisionSite', incisionSite, INCISION_SITES);
  return INCISION_SITE_TO_ARISCAT[site];
}

/**
 * Consistency of the ASA E modifier with the case's urgency. ARISCAT's emergency factor comes
 * from urgency alone, so a disagreeing E is a warning to resolve, not a second source.
 * ASA VI never takes an E (ASA physical status classification): that is an error.
 *
 * @returns errors (cannot be stored) and warnings (store, but check)
 * @throws AnalysisInputError when a field is missing or not a known code
 */
export function checkAsaUrgency(input: { asaClass: AsaClass; asaEmergency: boolean; urgency: Urgency }): ConsistencyResult {
  const fn = 'checkAsaUrgency';
  requireObject(fn, 'input', input);
  const asaClass = requireOneOf(fn, 'asaClass', input.asaClass, ASA_CLASSES);
  const e = requireBoolean(fn, 'asaEmergency', input.asaEmergency);
  const urgency = requireOneOf(fn, 'urgency', input.urgency, URGENCIES);
  const result: ConsistencyResult = { errors: [], warnings: [] };
  if (asaClass === 'VI' && e) {
    result.errors.push({
      path: 'asaEmergency',
      message: 'ASA VI takes no E modifier',
      hint: 'clear the E modifier, or correct the ASA class',
    });
  }
  if (e && urgency === 'elective') {
    result.warnings.push({
      path: 'asaEmergency',
      message: 'ASA class has the E modifier but the operation is recorded as elective; ARISCAT scores urgency (elective), so check which is right',
    });
  } else if (!e && urgency === 'emergency') {
    result.warnings.push({
      path: 'asaEmergency',
      message: 'the operation is recorded as an emergency but the ASA class has no E modifier; check which is right',
    });
  }
  return result;
}
