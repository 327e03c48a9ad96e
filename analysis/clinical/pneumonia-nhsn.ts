/**
 * CDC/NHSN clinically defined pneumonia (PNU1) over dated observations.
 *
 * Definition and version: CDC National Healthcare Safety Network, Patient Safety Component
 * Manual, January 2022: chapter 6 (Pneumonia, PNEU), PNU1; chapter 2 (Identifying HAIs) for the
 * infection window period, date of event, present on admission and repeat infection timeframe.
 *
 * Criteria:
 * 1. Imaging: two or more serial chest images with a new and persistent, or progressive and
 *    persistent, infiltrate, consolidation or cavitation; in a patient without underlying
 *    cardiac or pulmonary disease one definitive image suffices.
 * 2. At least one of: fever > 38.0 °C; WBC ≤ 4,000/mm3 or ≥ 12,000/mm3; for adults ≥ 70 years,
 *    altered mental status with no other recognised cause.
 * 3. At least two of: new purulent sputum, change in sputum character, more secretions or more
 *    suctioning; new or worse cough, dyspnoea or tachypnoea; rales or bronchial breath sounds;
 *    worse gas exchange (PaO2/FiO2 ≤ 240 mmHg, more oxygen or more ventilator demand).
 *
 * Alveolog's reading of the timing rules (stated here because the manual leaves choices):
 * - The diagnostic test of PNU1 is the chest image, so the infection window period is set by
 *   the first positive image (new or progressive infiltrate, consolidation or cavitation): its
 *   date, the 3 calendar days before and the 3 after (7 days). Before admission the window
 *   reaches back at most 2 days (the present-on-admission period, NHSN chapter 2).
 * - Every element used must fall inside the window, including the later image that shows the
 *   finding persistent (our stricter reading: "all elements within the window").
 * - When the first positive image does not lead to a met definition, each later positive image
 *   is tried as the start of a new window, in date order.
 * - Date of event: the earliest date of any element used, inside the window; an element in the
 *   2 days before admission gives the day of admission.
 * - Present on admission when the date of event is hospital day 1 (day of admission) or 2;
 *   healthcare-associated from day 3.
 * - Repeat infection timeframe: 14 days with the date of event as day 1; a date of event within
 *   days 1–14 of an earlier pneumonia's is not a new event.
 * - SpO2 readings alone do not count as worse gas exchange (the manual gives no SpO2 figure).
 */
import type { Observation } from '../../shared/clinical/observations.js';
import type { CriterionResult, Pnu1Result } from '../../shared/clinical/definition-results.js';
import { toStoredUnit, UNIT_LABELS } from '../../shared/clinical/units.js';
import { AnalysisInputError } from '../errors.js';
import { atLeast, evaluateCriterion, fromCondition, notApplicable, type DaySpan } from './criteria.js';
import { dayNumber, isoFromDayNumber } from './dates.js';
import { dateObservations, ofKind, type DatedObservation } from './observation-dates.js';
import { requireBoolean, requireNumber, requireObject } from './require.js';

export const PNU1_DEFINITION = 'CDC/NHSN PNU1' as const;
export const PNU1_VERSION = '2022' as const;
export const PNU1_SOURCE =
  'CDC NHSN Patient Safety Component Manual, January 2022: ch. 6 Pneumonia (PNEU) event, PNU1; ch. 2 Identifying HAIs';

/** Thresholds of PNU1 (NHSN 2022). */
export const PNU1_THRESHOLDS = {
  feverAboveC: 38.0,
  wbcAtMostPerMm3: 4000,
  wbcAtLeastPerMm3: 12000,
  alteredMentalStatusMinAge: 70,
  pfRatioAtMostMmHg: 240,
  windowDaysEachSide: 3,
  daysBeforeAdmissionInWindow: 2,
  presentOnAdmissionLastHospitalDay: 2,
  repeatInfectionTimeframeDays: 14,
} as const;

const T = PNU1_THRESHOLDS;
const PNEUMONIA_FINDINGS = new Set(['infiltrate', 'consolidation', 'cavitation']);

export interface PneumoniaNhsnInput {
  readonly observations: readonly Observation[];
  /** Date of admission to the inpatient location (hospital day 1). */
  readonly admissionDate: string;
  readonly surgeryDate: string;
  /** Age in years at the event. */
  readonly ageYears: number;
  /** Underlying cardiac or pulmonary disease (e.g. COPD, heart failure, pulmonary oedema). */
  readonly underlyingCardiacOrPulmonaryDisease: boolean;
  /** Date of event of an earlier pneumonia in this patient, for the repeat infection timeframe. */
  readonly previousPneumoniaDateOfEvent?: string | null;
}

type Img = DatedObservation<Extract<Observation, { kind: 'chest-imaging' }>>;

const pneumoniaFindings = (img: Img, courses: readonly string[]) =>
  img.obs.findings.filter((f) => PNEUMONIA_FINDINGS.has(f.type) && f.course !== undefined && courses.includes(f.course));
const isPositive = (img: Img) => pneumoniaFindings(img, ['new', 'progressive']).length > 0;
const isPersisting = (img: Img) => pneumoniaFindings(img, ['persistent', 'progressive']).length > 0;
const describeImage = (img: Img, courses: readonly string[]) =>
  `${pneumoniaFindings(img, courses)
    .map((f) => `${f.course} ${f.type}`)
    .join(', ')} on ${img.date}`;

function imagingCriterion(images: readonly Img[], anchor: Img | null, span: DaySpan | null, underlying: boolean): CriterionResult {
  const id = 'imaging';
  const label = 'Chest imaging: new or progressive and persistent infiltrate, consolidation or cavitation';
  if (!anchor || !span) {
    return fromCondition(
      id,
      label,
      false,
      images.length ? 'not-met' : 'missing',
      images.length
        ? 'no chest image shows a new or progressive infiltrate, consolidation or cavitation'
        : 'no chest imaging recorded',
    );
  }
  const confirm = images.find((i) => i.day > anchor.day && span.end !== null && i.day <= span.end && isPersisting(i));
  if (confirm) {
    return fromCondition(
      id,
      label,
      true,
      'met',
      `serial images: ${describeImage(anchor, ['new', 'progressive'])}, then ${describeImage(confirm, ['persistent', 'progressive'])}`,
      [anchor.obs.id, confirm.obs.id],
    );
  }
  if (!underlying && anchor.obs.definitive === true) {
    return fromCondition(
      id,
      label,
      true,
      'met',
      `one definitive image (${describeImage(anchor, ['new', 'progressive'])}) in a patient without underlying cardiac or pulmonary disease`,
      [anchor.obs.id],
    );
  }
  const why = underlying
    ? 'the patient has underlying cardiac or pulmonary disease, so a second, later image inside the window must show it persistent'
    : 'the image is not marked definitive, and no later image inside the window shows it persistent';
  return fromCondition(id, label, false, 'not-met', `${describeImage(anchor, ['new', 'progressive'])}: ${why}`);
}

function signCriteria(dated: readonly DatedObservation[], span: DaySpan, ageYears: number) {
  const temps = ofKind(dated, 'temperature-max');
  const tempC = (d: (typeof temps)[number]) => toStoredUnit('temperature', d.obs.value, d.obs.unit);
  const fever = evaluateCriterion({
    id: 'fever',
    label: 'Fever > 38.0 °C',
    candidates: temps,
    span,
    qualifies: (d) => tempC(d) > T.feverAboveC,
    describe: (d) => `${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.date}`,
    threshold: 'above 38.0 °C',
    evidence: 'temperature',
  });

  const wbcs = ofKind(dated, 'wbc');
  const perMm3 = (d: (typeof wbcs)[number]) => toStoredUnit('wbc', d.obs.value, d.obs.unit);
  const wbc = evaluateCriterion({
    id: 'leukopenia-or-leukocytosis',
    label: 'WBC ≤ 4,000/mm³ or ≥ 12,000/mm³',
    candidates: wbcs,
    span,
    qualifies: (d) => perMm3(d) <= T.wbcAtMostPerMm3 || perMm3(d) >= T.wbcAtLeastPerMm3,
    describe: (d) => `WBC ${perMm3(d)}/mm³ (${d.obs.which}) on ${d.date}`,
    threshold: 'at most 4,000 or at least 12,000/mm³',
    evidence: 'white-cell count',
  });

  const amsLabel = 'Altered mental status, no other cause (adults ≥ 70 years)';
  const mental =
    ageYears >= T.alteredMentalStatusMinAge
      ? evaluateCriterion({
          id: 'altered-mental-status',
          label: amsLabel,
          candidates: ofKind(dated, 'mental-status'),
          span,
          qualifies: (d) => d.obs.altered && !d.obs.otherRecognisedCause,
          describe: (d) =>
            `${d.obs.altered ? 'altered' : 'not altered'}${d.obs.altered && d.obs.otherRecognisedCause ? ' with another recognised cause' : ''} on ${d.date}`,
          threshold: 'altered without another cause',
          evidence: 'mental-status assessment',
        })
      : notApplicable('altered-mental-status', amsLabel, `applies only to adults aged 70 or over; the patient is ${ageYears}`);

  const sputum = evaluateCriterion({
    id: 'sputum',
    label: 'New purulent sputum, changed sputum, more secretions or suctioning',
    candidates: ofKind(dated, 'sputum'),
    span,
    qualifies: (d) => d.obs.newPurulent || d.obs.changedCharacter || d.obs.increasedSecretionsOrSuctioning,
    describe: (d) => {
      const parts = [
        d.obs.newPurulent && 'new purulent sputum',
        d.obs.changedCharacter && 'changed sputum',
        d.obs.increasedSecretionsOrSuctioning && 'more secretions or suctioning',
      ].filter(Boolean);
      return `${parts.length ? parts.join(', ') : 'sputum unchanged'} on ${d.date}`;
    },
    threshold: 'new, changed or increased',
    evidence: 'sputum finding',
  });

  const cough = evaluateCriterion({
    id: 'cough-dyspnoea-tachypnoea',
    label: 'New or worse cough, dyspnoea or tachypnoea',
    candidates: ofKind(dated, 'respiratory-sign'),
    span,
    qualifies: () => true,
    describe: (d) => `${d.obs.onset} ${d.obs.sign} on ${d.date}`,
    threshold: 'new or worse',
    evidence: 'cough, dyspnoea or tachypnoea',
  });

  const rales = evaluateCriterion({
    id: 'rales-or-bronchial-breath-sounds',
    label: 'Rales or bronchial breath sounds',
    candidates: ofKind(dated, 'auscultation'),
    span,
    qualifies: (d) => d.obs.finding === 'rales' || d.obs.finding === 'bronchial-breath-sounds',
    describe: (d) => `${d.obs.finding.replace(/-/g, ' ')} on ${d.date}`,
    threshold: 'rales or bronchial breath sounds',
    evidence: 'auscultation',
  });

  const pf = ofKind(dated, 'pf-ratio');
  const o2 = ofKind(dated, 'supplemental-oxygen');
  const pfMmHg = (d: (typeof pf)[number]) => toStoredUnit('pf-ratio', d.obs.value, d.obs.unit);
  const gas = evaluateCriterion<DatedObservation>({
    id: 'worse-gas-exchange',
    label: 'Worse gas exchange: PaO2/FiO2 ≤ 240 mmHg, more oxygen or ventilator demand',
    candidates: [...pf, ...o2],
    span,
    qualifies: (d) => (d.obs.kind === 'pf-ratio' ? pfMmHg(d as (typeof pf)[number]) <= T.pfRatioAtMostMmHg : true),
    describe: (d) =>
      d.obs.kind === 'pf-ratio'
        ? `PaO2/FiO2 ${pfMmHg(d as (typeof pf)[number])} mmHg on ${d.date}`
        : `oxygen support ${(d as (typeof o2)[number]).obs.change.replace(/-/g, ' ')} on ${d.date}`,
    threshold: 'PaO2/FiO2 at most 240 mmHg',
    evidence: 'PaO2/FiO2 or oxygen-support change',
  });

  const systemic = [fever, wbc, mental];
  const respiratory = [sputum, cough, rales, gas];
  return {
    systemic,
    respiratory,
    oneOf: atLeast('at-least-one-systemic', 'At least one of fever, WBC, altered mental status', 1, systemic),
    twoOf: atLeast('at-least-two-respiratory', 'At least two respiratory signs', 2, respiratory),
  };
}

/**
 * Evaluates CDC/NHSN PNU1 (version 2022; see the module comment for the rules and Alveolog's
 * reading of the window) over an infection event's dated observations.
 *
 * @param input.observations the event's evidence (validated with `ObservationSchema`)
 * @param input.admissionDate, input.surgeryDate ISO dates; surgery not before admission
 * @param input.ageYears 0–130
 * @param input.underlyingCardiacOrPulmonaryDisease boolean
 * @param input.previousPneumoniaDateOfEvent optional ISO date
 * @returns per-criterion results and the overall result with window, date of event and
 *   present-on-admission status (null when not met)
 * @throws AnalysisInputError for missing or invalid input, naming the field
 * @example a patient without underlying disease with a definitive image of new consolidation on
 *   day 3, fever 38.5 °C and new cough and rales the same day: met, date of event = that day.
 */
export function pneumoniaNhsnPnu1(input: PneumoniaNhsnInput): Pnu1Result {
  const fn = 'pneumoniaNhsnPnu1';
  requireObject(fn, 'input', input);
  const admission = dayNumber(fn, 'admissionDate', input.admissionDate);
  const surgery = dayNumber(fn, 'surgeryDate', input.surgeryDate);
  if (surgery < admission) {
    throw new AnalysisInputError(fn, 'surgeryDate', `(${input.surgeryDate}) is before admissionDate (${input.admissionDate}); check both dates`);
  }
  const age = requireNumber(fn, 'ageYears', input.ageYears, { min: 0, max: 130, unit: 'years' });
  const underlying = requireBoolean(fn, 'underlyingCardiacOrPulmonaryDisease', input.underlyingCardiacOrPulmonaryDisease);
  const previous =
    input.previousPneumoniaDateOfEvent === undefined || input.previousPneumoniaDateOfEvent === null
      ? null
      : dayNumber(fn, 'previousPneumoniaDateOfEvent', input.previousPneumoniaDateOfEvent);
  const dated = dateObservations(fn, input.observations, input.surgeryDate);

  const images = ofKind(dated, 'chest-imaging').sort((a, b) => a.day - b.day || a.obs.id.localeCompare(b.obs.id));
  const anchors = images.filter(isPositive);

  const evaluate = (anchor: Img | null): Pnu1Result => {
    const span: DaySpan | null = anchor
      ? {
          start: Math.max(anchor.day - T.windowDaysEachSide, admission - T.daysBeforeAdmissionInWindow),
          end: anchor.day + T.windowDaysEachSide,
        }
      : null;
    const imaging = imagingCriterion(images, anchor, span, underlying);
    // Without a window, signs are shown over the whole record for the reasons only.
    const signs = signCriteria(dated, span ?? { start: null, end: null }, age);
    const criteria = [imaging, ...signs.systemic, signs.oneOf, ...signs.respiratory, signs.twoOf];
    const met = imaging.met && signs.oneOf.met && signs.twoOf.met;

    let dateOfEvent: string | null = null;
    let hospitalDay: number | null = null;
    let rit: boolean | null = null;
    if (met) {
      const used = new Set([...imaging.observationIds, ...signs.oneOf.observationIds, ...signs.twoOf.observationIds]);
      const first = Math.min(...dated.filter((d) => used.has(d.obs.id)).map((d) => d.day));
      const doe = Math.max(first, admission);
      dateOfEvent = isoFromDayNumber(doe);
      hospitalDay = doe - admission + 1;
      if (previous !== null) {
        const sincePrevious = doe - previous;
        rit = sincePrevious >= 0 && sincePrevious < T.repeatInfectionTimeframeDays;
      }
    }
    return {
      definition: PNU1_DEFINITION,
      version: PNU1_VERSION,
      source: PNU1_SOURCE,
      met,
      criteria,
      anchorObservationId: anchor?.obs.id ?? null,
      windowStart: span?.start != null ? isoFromDayNumber(span.start) : null,
      windowEnd: span?.end != null ? isoFromDayNumber(span.end) : null,
      dateOfEvent,
      hospitalDayOfEvent: hospitalDay,
      presentOnAdmission: hospitalDay === null ? null : hospitalDay <= T.presentOnAdmissionLastHospitalDay,
      healthcareAssociated: hospitalDay === null ? null : hospitalDay > T.presentOnAdmissionLastHospitalDay,
      withinRepeatInfectionTimeframe: rit,
    };
  };

  if (anchors.length === 0) return evaluate(null);
  let firstResult: Pnu1Result | null = null;
  for (const anchor of anchors) {
    const r = evaluate(anchor);
    if (r.met) return r;
    firstResult ??= r;
  }
  return firstResult as Pnu1Result;
}

/**
 * Whether a pneumonia's date of event falls in the repeat infection timeframe of an earlier
 * one: the 14 days starting with the earlier date of event as day 1 (NHSN 2022, chapter 2).
 * @throws AnalysisInputError for invalid dates
 * @example withinRepeatInfectionTimeframe('2024-03-01', '2024-03-14') // true (day 14); '2024-03-15' -> false
 */
export function withinRepeatInfectionTimeframe(previousDateOfEvent: string, dateOfEvent: string): boolean {
  const fn = 'withinRepeatInfectionTimeframe';
  const d = dayNumber(fn, 'dateOfEvent', dateOfEvent) - dayNumber(fn, 'previousDateOfEvent', previousDateOfEvent);
  return d >= 0 && d < T.repeatInfectionTimeframeDays;
}
