/**
 * Melbourne Group Scale (version 3) for post-operative pulmonary complications over dated
 * observations.
 *
 * Definition and version: Melbourne Group Scale version 3, as used in physiotherapy trials of
 * post-operative care (TRADE.md: checked in a secondary copy). A PPC is present when 4 or more
 * of these 8 criteria are met on one post-operative day:
 * 1. new abnormal breath sounds on auscultation;
 * 2. yellow, green or brown sputum;
 * 3. SpO2 < 90% on room air on more than one consecutive post-operative day;
 * 4. temperature ≥ 38 °C on more than one consecutive post-operative day;
 * 5. chest imaging report of collapse or consolidation;
 * 6. organisms on sputum culture;
 * 7. white-cell count > 11 or < 3 × 10^9/L;
 * 8. physician's diagnosis of a pulmonary complication or chest infection, or an antibiotic
 *    for a respiratory infection.
 *
 * Alveolog's reading of the timing (the scale is scored daily):
 * - days scored are post-operative days 1 onward that have at least one observation;
 * - each criterion counts on day d from observations dated day d (imaging and culture by the
 *   date of the image or specimen);
 * - "more than one consecutive day" is met on day d when the finding is present on d and on an
 *   adjacent scored day (d − 1 or d + 1, day 1 onward), i.e. d belongs to a run of two or more
 *   post-operative days; the day of surgery does not count toward the run.
 */
import type { CriterionResult, MgsDayResult, MgsResult } from '../../shared/clinical/definition-results.js';
import type { Observation } from '../../shared/clinical/observations.js';
import { toStoredUnit, UNIT_LABELS } from '../../shared/clinical/units.js';
import { evaluateCriterion, fromCondition, type DaySpan } from './criteria.js';
import { dayNumber, isoFromDayNumber } from './dates.js';
import { dateObservations, ofKind, type DatedObservation } from './observation-dates.js';
import { requireObject } from './require.js';

export const MGS_DEFINITION = 'Melbourne Group Scale' as const;
export const MGS_VERSION = '3' as const;
export const MGS_SOURCE = 'Melbourne Group Scale version 3 (criteria as collected in TRADE.md, checked in a secondary copy)';

export const MGS_THRESHOLDS = {
  criteriaNeeded: 4,
  spo2BelowPercentOnAir: 90,
  temperatureAtLeastC: 38,
  wccAboveGigaPerL: 11,
  wccBelowGigaPerL: 3,
  firstScoredPostoperativeDay: 1,
} as const;
const T = MGS_THRESHOLDS;

const PURULENT_COLOURS = new Set(['yellow', 'green', 'brown']);
const IMAGING_TYPES = ['collapse', 'collapse-with-shift', 'consolidation'];

export interface MelbourneGroupScaleInput {
  readonly observations: readonly Observation[];
  readonly surgeryDate: string;
}

type D = DatedObservation;

/**
 * Criterion over two consecutive days: met on `day` when qualifying readings exist on `day`
 * and on `day - 1` or `day + 1`.
 */
function consecutive<O extends D>(args: {
  id: string;
  label: string;
  candidates: readonly O[];
  day: number;
  /** Earliest day that counts as a neighbour (post-operative day 1). */
  firstDay: number;
  qualifies: (d: O) => boolean;
  describe: (d: O) => string;
  evidence: string;
  threshold: string;
}): CriterionResult {
  const { id, label, candidates, day, firstDay, qualifies, describe, evidence, threshold } = args;
  const on = (n: number) => candidates.filter((c) => c.day === n);
  const today = on(day);
  if (today.length === 0) return fromCondition(id, label, false, 'missing', `no ${evidence} recorded on ${isoFromDayNumber(day)}`);
  const hitsToday = today.filter(qualifies);
  if (hitsToday.length === 0) {
    return fromCondition(id, label, false, 'not-met', `not ${threshold} on ${isoFromDayNumber(day)}: ${today.map(describe).join('; ')}`);
  }
  const adjacent = [day - 1, day + 1].filter((n) => n >= firstDay);
  for (const n of adjacent) {
    const hits = on(n).filter(qualifies);
    if (hits.length > 0) {
      return fromCondition(
        id,
        label,
        true,
        'met',
        `${hitsToday.map(describe).join('; ')}; and ${hits.map(describe).join('; ')}`,
        [...hitsToday, ...hits].map((d) => d.obs.id),
      );
    }
  }
  const neighbours = adjacent.flatMap(on);
  return fromCondition(
    id,
    label,
    false,
    neighbours.length ? 'not-met' : 'missing',
    neighbours.length
      ? `${hitsToday.map(describe).join('; ')}, but not on the day before or after: ${neighbours.map(describe).join('; ')}`
      : `${hitsToday.map(describe).join('; ')}, but no ${evidence} recorded on the day before or after`,
  );
}

function scoreDay(dated: readonly D[], day: number, surgery: number): MgsDayResult {
  const span: DaySpan = { start: day, end: day };
  const common = { span, mentionOutside: false } as const;

  const breath = evaluateCriterion({
    ...common,
    id: 'new-abnormal-breath-sounds',
    label: 'New abnormal breath sounds',
    candidates: ofKind(dated, 'auscultation'),
    qualifies: (d) => d.obs.finding !== 'normal' && d.obs.newSinceBaseline,
    describe: (d) => `${d.obs.finding.replace(/-/g, ' ')}${d.obs.newSinceBaseline ? ' (new)' : ''}`,
    threshold: 'new and abnormal',
    evidence: 'auscultation',
  });
  const sputum = evaluateCriterion({
    ...common,
    id: 'yellow-green-brown-sputum',
    label: 'Yellow, green or brown sputum',
    candidates: ofKind(dated, 'sputum'),
    qualifies: (d) => d.obs.colour !== undefined && PURULENT_COLOURS.has(d.obs.colour),
    describe: (d) => `sputum ${d.obs.colour ?? 'colour not recorded'}`,
    threshold: 'yellow, green or brown',
    evidence: 'sputum colour',
  });
  const spo2 = consecutive({
    id: 'spo2-below-90-on-air-consecutive-days',
    label: 'SpO2 < 90% on room air on more than one consecutive day',
    candidates: ofKind(dated, 'spo2').filter((d) => d.obs.breathing === 'room-air'),
    day,
    firstDay: surgery + T.firstScoredPostoperativeDay,
    qualifies: (d) => d.obs.percent < T.spo2BelowPercentOnAir,
    describe: (d) => `SpO2 ${d.obs.percent}% on air on ${d.date}`,
    evidence: 'SpO2 on room air',
    threshold: 'below 90%',
  });
  const temps = ofKind(dated, 'temperature-max');
  const tempC = (d: (typeof temps)[number]) => toStoredUnit('temperature', d.obs.value, d.obs.unit);
  const temperature = consecutive({
    id: 'temperature-38-consecutive-days',
    label: 'Temperature ≥ 38 °C on more than one consecutive day',
    candidates: temps,
    day,
    firstDay: surgery + T.firstScoredPostoperativeDay,
    qualifies: (d) => tempC(d) >= T.temperatureAtLeastC,
    describe: (d) => `${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.date}`,
    evidence: 'temperature',
    threshold: 'at least 38 °C',
  });
  const imaging = evaluateCriterion({
    ...common,
    id: 'imaging-collapse-or-consolidation',
    label: 'Chest imaging: collapse or consolidation',
    candidates: ofKind(dated, 'chest-imaging'),
    qualifies: (d) => d.obs.findings.some((f) => IMAGING_TYPES.includes(f.type)),
    describe: (d) => d.obs.findings.map((f) => f.type.replace(/-/g, ' ')).join(', '),
    threshold: 'collapse or consolidation',
    evidence: 'chest imaging',
  });
  const culture = evaluateCriterion({
    ...common,
    id: 'sputum-culture-organisms',
    label: 'Organisms on sputum culture',
    candidates: ofKind(dated, 'sputum-culture'),
    qualifies: (d) => d.obs.organismsGrown,
    describe: (d) => (d.obs.organismsGrown ? 'organisms grown' : 'no organisms grown'),
    threshold: 'growing organisms',
    evidence: 'sputum culture',
  });
  const wbcs = ofKind(dated, 'wbc');
  const giga = (d: (typeof wbcs)[number]) => toStoredUnit('wbc', d.obs.value, d.obs.unit) / 1000;
  const wcc = evaluateCriterion({
    ...common,
    id: 'wcc-above-11-or-below-3',
    label: 'White-cell count > 11 or < 3 × 10⁹/L',
    candidates: wbcs,
    qualifies: (d) => giga(d) > T.wccAboveGigaPerL || giga(d) < T.wccBelowGigaPerL,
    describe: (d) => `WCC ${giga(d)} × 10⁹/L`,
    threshold: 'above 11 or below 3 × 10⁹/L',
    evidence: 'white-cell count',
  });
  const diagnosis = evaluateCriterion<D>({
    ...common,
    id: 'physician-diagnosis-or-respiratory-antibiotic',
    label: 'Physician diagnosis of a pulmonary complication or chest infection, or a respiratory antibiotic',
    candidates: [...ofKind(dated, 'physician-diagnosis'), ...ofKind(dated, 'antibiotics-started')],
    qualifies: (d) =>
      d.obs.kind === 'physician-diagnosis'
        ? d.obs.diagnosis !== 'reintubation'
        : d.obs.kind === 'antibiotics-started' && d.obs.indication === 'suspected-respiratory-infection',
    describe: (d) =>
      d.obs.kind === 'physician-diagnosis'
        ? `physician diagnosis: ${d.obs.diagnosis.replace(/-/g, ' ')}`
        : `antibiotics (${(d.obs as Extract<Observation, { kind: 'antibiotics-started' }>).indication.replace(/-/g, ' ')})`,
    threshold: 'a pulmonary diagnosis or respiratory antibiotic',
    evidence: 'physician diagnosis or antibiotic',
  });

  const criteria = [breath, sputum, spo2, temperature, imaging, culture, wcc, diagnosis];
  const criteriaMet = criteria.filter((c) => c.met).length;
  return {
    postoperativeDay: day - surgery,
    date: isoFromDayNumber(day),
    criteriaMet,
    met: criteriaMet >= T.criteriaNeeded,
    criteria,
  };
}

/**
 * Scores the Melbourne Group Scale (version 3) on every post-operative day with observations
 * (see the module comment for the criteria and Alveolog's reading of the timing).
 *
 * @param input.observations validated with `ObservationSchema`
 * @param input.surgeryDate ISO date (day 0)
 * @returns per day the 8 criteria with reasons; `met` when 4 or more are met on one day
 * @throws AnalysisInputError for missing or invalid input, naming the field
 * @example on day 3: new rales, green sputum, consolidation on the day's radiograph and a
 *   respiratory antibiotic -> 4 criteria, met, firstPostoperativeDayMet 3.
 */
export function melbourneGroupScale(input: MelbourneGroupScaleInput): MgsResult {
  const fn = 'melbourneGroupScale';
  requireObject(fn, 'input', input);
  const dated = dateObservations(fn, input.observations, input.surgeryDate);
  const surgery = dayNumber(fn, 'surgeryDate', input.surgeryDate);
  const days = [...new Set(dated.filter((d) => d.postoperativeDay >= T.firstScoredPostoperativeDay).map((d) => d.day))].sort(
    (a, b) => a - b,
  );
  const scored = days.map((day) => scoreDay(dated, day, surgery));
  const first = scored.find((d) => d.met);
  return {
    definition: MGS_DEFINITION,
    version: MGS_VERSION,
    source: MGS_SOURCE,
    met: first !== undefined,
    firstPostoperativeDayMet: first ? first.postoperativeDay : null,
    maxCriteriaMet: scored.reduce((m, d) => Math.max(m, d.criteriaMet), 0),
    days: scored,
  };
}
