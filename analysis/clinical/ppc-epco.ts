/**
 * European Perioperative Clinical Outcome (EPCO) definitions of post-operative pulmonary
 * complications over dated observations.
 *
 * Definition and version: Jammer I, Wickboldt N, Sander M, et al. Standards for definitions and
 * use of outcome measures for clinical effectiveness research in perioperative medicine:
 * European Perioperative Clinical Outcome (EPCO) definitions. Eur J Anaesthesiol
 * 2015;32:88-105. Components (pneumonia by the CDC criteria and ARDS by the Berlin definition
 * are evaluated elsewhere, not here):
 * - respiratory infection: antibiotics for a suspected respiratory infection, plus one or more
 *   of new or changed sputum, new or changed lung opacities, fever, WBC > 12 × 10^9/L;
 * - respiratory failure: PaO2 < 8 kPa (60 mmHg) on room air, PaO2/FiO2 < 40 kPa (300 mmHg), or
 *   SpO2 < 90% needing oxygen therapy;
 * - pleural effusion: the chest-imaging picture of an effusion;
 * - atelectasis: lung opacification with shift of mediastinum, hilum or hemidiaphragm toward
 *   the affected area and compensatory over-inflation of the adjacent lung;
 * - pneumothorax: air in the pleural space;
 * - bronchospasm: newly detected expiratory wheeze treated with bronchodilators;
 * - aspiration pneumonitis: acute lung injury after inhalation of regurgitated gastric contents.
 *
 * Alveolog's operational choices (the paper gives no figure or timing for these):
 * - fever is > 38.0 °C, the CDC/NHSN figure (EPCO names fever without a number);
 * - SpO2 < 90% "needing oxygen therapy": read while on supplemental oxygen, or on room air
 *   with oxygen started or increased the same or the next day;
 * - bronchodilator treatment counts on or after the day of the new wheeze;
 * - acute lung injury after aspiration: on or after the inhalation, a new or progressive
 *   infiltrate or consolidation and PaO2/FiO2 ≤ 300 mmHg (the acute-lung-injury figure of
 *   the American-European Consensus Conference, Bernard GR et al., Am J Respir Crit Care Med
 *   1994;149:818-24; from memory); inhalation must be witnessed or suctioned from the airway;
 * - only observations from the day of surgery on count; the evidence is the event's own, so
 *   no further time window is applied unless `untilPostoperativeDay` is given.
 */
import type { CriterionResult, EpcoComponent, EpcoComponentResult, EpcoResult } from '../../shared/clinical/definition-results.js';
import type { Observation } from '../../shared/clinical/observations.js';
import { toStoredUnit, UNIT_LABELS } from '../../shared/clinical/units.js';
import { atLeast, evaluateCriterion, inSpan, type DaySpan } from './criteria.js';
import { dayNumber } from './dates.js';
import { dateObservations, ofKind, type DatedObservation } from './observation-dates.js';
import { requireNumber, requireObject } from './require.js';

export const EPCO_DEFINITION = 'EPCO' as const;
export const EPCO_VERSION = '2015' as const;
export const EPCO_SOURCE = 'Jammer I et al., Eur J Anaesthesiol 2015;32:88-105 (European Perioperative Clinical Outcome definitions)';

/**
 * EPCO thresholds. `memory` marks figures TRADE.md records as recalled rather than seen
 * (respiratory infection and respiratory failure figures); `alveolog` marks our own choices.
 */
export const EPCO_THRESHOLDS = {
  wbcAboveGigaPerL: { value: 12, note: 'memory (TRADE.md); seen in a secondary copy' },
  pao2BelowMmHgOnAir: { value: 60, note: 'memory (TRADE.md): 8 kPa (60 mmHg)' },
  pfRatioBelowMmHg: { value: 300, note: 'memory (TRADE.md): 40 kPa (300 mmHg)' },
  spo2BelowPercent: { value: 90, note: 'memory (TRADE.md)' },
  feverAboveC: { value: 38.0, note: 'alveolog: EPCO gives no figure; the CDC/NHSN figure' },
  aliPfRatioAtMostMmHg: { value: 300, note: 'alveolog: AECC acute lung injury (Bernard 1994; from memory)' },
} as const;

const T = EPCO_THRESHOLDS;

export const EPCO_COMPONENT_LABELS: Record<EpcoComponent, string> = {
  'respiratory-infection': 'Respiratory infection',
  'respiratory-failure': 'Respiratory failure',
  'pleural-effusion': 'Pleural effusion',
  atelectasis: 'Atelectasis',
  pneumothorax: 'Pneumothorax',
  bronchospasm: 'Bronchospasm',
  'aspiration-pneumonitis': 'Aspiration pneumonitis',
};

export interface PpcEpcoInput {
  readonly observations: readonly Observation[];
  readonly surgeryDate: string;
  /** Last post-operative day to consider (inclusive); all later days when omitted. */
  readonly untilPostoperativeDay?: number | null;
}

type D = DatedObservation;
type Img = DatedObservation<Extract<Observation, { kind: 'chest-imaging' }>>;

function imageHas(img: Img, types: readonly string[], courses?: readonly string[]) {
  return img.obs.findings.some((f) => types.includes(f.type) && (!courses || (f.course !== undefined && courses.includes(f.course))));
}
const describeImage = (img: Img) =>
  `${img.obs.findings.map((f) => (f.course ? `${f.course} ${f.type}` : f.type)).join(', ')} on ${img.date}`;

/** Earliest post-operative day of the observations a met criterion used. */
function firstDay(dated: readonly D[], ids: readonly string[]): number | null {
  const days = dated.filter((d) => ids.includes(d.obs.id)).map((d) => d.postoperativeDay);
  return days.length ? Math.min(...days) : null;
}

function component(
  componentId: EpcoComponent,
  criteria: CriterionResult[],
  decisive: CriterionResult,
  onset: number | null,
): EpcoComponentResult {
  return { component: componentId, label: EPCO_COMPONENT_LABELS[componentId], met: decisive.met, onsetPostoperativeDay: decisive.met ? onset : null, criteria };
}

function imagingComponent(componentId: EpcoComponent, dated: readonly D[], images: Img[], span: DaySpan, type: string, label: string): EpcoComponentResult {
  const c = evaluateCriterion({
    id: `imaging-${type}`,
    label,
    candidates: images,
    span,
    qualifies: (d) => imageHas(d, [type]),
    describe: describeImage,
    threshold: `showing ${type.replace(/-/g, ' ')}`,
    evidence: 'chest imaging',
  });
  return component(componentId, [c], c, firstDay(dated, c.observationIds));
}

/**
 * Evaluates the EPCO PPC components (Jammer et al. 2015; see the module comment for each
 * definition and Alveolog's operational choices) over an event's dated observations.
 *
 * @param input.observations validated with `ObservationSchema`
 * @param input.surgeryDate ISO date; observations before it are not counted
 * @param input.untilPostoperativeDay optional last day to count (0–365)
 * @returns per component: met, onset (post-operative day) and per-criterion reasons; `met` when any component is
 * @throws AnalysisInputError for missing or invalid input, naming the field
 * @example antibiotics for a suspected respiratory infection on day 3 with new purulent sputum
 *   the same day: respiratory infection met, onset day 3.
 */
export function ppcEpco(input: PpcEpcoInput): EpcoResult {
  const fn = 'ppcEpco';
  requireObject(fn, 'input', input);
  const surgery = dayNumber(fn, 'surgeryDate', input.surgeryDate);
  const until =
    input.untilPostoperativeDay === undefined || input.untilPostoperativeDay === null
      ? null
      : requireNumber(fn, 'untilPostoperativeDay', input.untilPostoperativeDay, { min: 0, max: 365, integer: true });
  const dated = dateObservations(fn, input.observations, input.surgeryDate);
  const span: DaySpan = { start: surgery, end: until === null ? null : surgery + until };
  const images = ofKind(dated, 'chest-imaging');

  // Respiratory infection.
  const abx = evaluateCriterion({
    id: 'antibiotics-for-suspected-respiratory-infection',
    label: 'Antibiotics for a suspected respiratory infection',
    candidates: ofKind(dated, 'antibiotics-started'),
    span,
    qualifies: (d) => d.obs.indication === 'suspected-respiratory-infection',
    describe: (d) => `antibiotics (${d.obs.indication.replace(/-/g, ' ')}) on ${d.date}`,
    threshold: 'given for a suspected respiratory infection',
    evidence: 'antibiotic start',
  });
  const sputum = evaluateCriterion({
    id: 'new-or-changed-sputum',
    label: 'New or changed sputum',
    candidates: ofKind(dated, 'sputum'),
    span,
    qualifies: (d) => d.obs.newPurulent || d.obs.changedCharacter,
    describe: (d) => `${d.obs.newPurulent ? 'new purulent' : d.obs.changedCharacter ? 'changed' : 'unchanged'} sputum on ${d.date}`,
    threshold: 'new or changed',
    evidence: 'sputum finding',
  });
  const opacities = evaluateCriterion({
    id: 'new-or-changed-opacities',
    label: 'New or changed lung opacities',
    candidates: images,
    span,
    qualifies: (d) => imageHas(d, ['infiltrate', 'consolidation', 'cavitation', 'collapse', 'collapse-with-shift'], ['new', 'progressive']),
    describe: describeImage,
    threshold: 'new or progressive opacities',
    evidence: 'chest imaging',
  });
  const temps = ofKind(dated, 'temperature-max');
  const fever = evaluateCriterion({
    id: 'fever',
    label: 'Fever (> 38.0 °C, Alveolog figure)',
    candidates: temps,
    span,
    qualifies: (d) => toStoredUnit('temperature', d.obs.value, d.obs.unit) > T.feverAboveC.value,
    describe: (d) => `${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.date}`,
    threshold: 'above 38.0 °C',
    evidence: 'temperature',
  });
  const wbcs = ofKind(dated, 'wbc');
  const giga = (d: (typeof wbcs)[number]) => toStoredUnit('wbc', d.obs.value, d.obs.unit) / 1000;
  const wbc = evaluateCriterion({
    id: 'wbc-above-12',
    label: 'WBC > 12 × 10⁹/L',
    candidates: wbcs,
    span,
    qualifies: (d) => giga(d) > T.wbcAboveGigaPerL.value,
    describe: (d) => `WBC ${giga(d)} × 10⁹/L on ${d.date}`,
    threshold: 'above 12 × 10⁹/L',
    evidence: 'white-cell count',
  });
  const supporting = atLeast('at-least-one-supporting', 'At least one of sputum, opacities, fever, WBC', 1, [sputum, opacities, fever, wbc]);
  const infectionMet = abx.met && supporting.met;
  const infection: EpcoComponentResult = {
    component: 'respiratory-infection',
    label: EPCO_COMPONENT_LABELS['respiratory-infection'],
    met: infectionMet,
    onsetPostoperativeDay: infectionMet
      ? Math.max(firstDay(dated, abx.observationIds) as number, firstDay(dated, supporting.observationIds) as number)
      : null,
    criteria: [abx, sputum, opacities, fever, wbc, supporting],
  };

  // Respiratory failure.
  const pao2s = ofKind(dated, 'pao2');
  const mmHg = (d: (typeof pao2s)[number]) => toStoredUnit('pao2', d.obs.value, d.obs.unit);
  const pao2 = evaluateCriterion({
    id: 'pao2-below-8-kpa-on-air',
    label: 'PaO2 < 8 kPa (60 mmHg) on room air',
    candidates: pao2s,
    span,
    qualifies: (d) => d.obs.breathing === 'room-air' && mmHg(d) < T.pao2BelowMmHgOnAir.value,
    describe: (d) => `PaO2 ${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.obs.breathing.replace('-', ' ')} on ${d.date}`,
    threshold: 'below 60 mmHg (8 kPa) on room air',
    evidence: 'PaO2',
  });
  const pfs = ofKind(dated, 'pf-ratio');
  const pfMmHg = (d: (typeof pfs)[number]) => toStoredUnit('pf-ratio', d.obs.value, d.obs.unit);
  const pf = evaluateCriterion({
    id: 'pf-below-40-kpa',
    label: 'PaO2/FiO2 < 40 kPa (300 mmHg)',
    candidates: pfs,
    span,
    qualifies: (d) => pfMmHg(d) < T.pfRatioBelowMmHg.value,
    describe: (d) => `PaO2/FiO2 ${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.date}`,
    threshold: 'below 300 mmHg (40 kPa)',
    evidence: 'PaO2/FiO2',
  });
  const oxygenStarts = ofKind(dated, 'supplemental-oxygen').filter((d) => inSpan(span, d.day));
  const spo2 = evaluateCriterion({
    id: 'spo2-below-90-needing-oxygen',
    label: 'SpO2 < 90% needing oxygen therapy',
    candidates: ofKind(dated, 'spo2'),
    span,
    qualifies: (d) =>
      d.obs.percent < T.spo2BelowPercent.value &&
      (d.obs.breathing === 'supplemental-oxygen' || oxygenStarts.some((o) => o.day === d.day || o.day === d.day + 1)),
    describe: (d) => `SpO2 ${d.obs.percent}% on ${d.obs.breathing.replace('-', ' ')} on ${d.date}`,
    threshold: 'below 90% with oxygen needed',
    evidence: 'SpO2',
  });
  const failureAny = atLeast('at-least-one-failure-sign', 'At least one of PaO2, PaO2/FiO2, SpO2', 1, [pao2, pf, spo2]);
  const failure = component('respiratory-failure', [pao2, pf, spo2, failureAny], failureAny, firstDay(dated, failureAny.observationIds));

  // Imaging-defined components.
  const effusion = imagingComponent('pleural-effusion', dated, images, span, 'effusion', 'Chest imaging shows a pleural effusion');
  const atelectasis = imagingComponent(
    'atelectasis',
    dated,
    images,
    span,
    'collapse-with-shift',
    'Opacification with shift toward it and compensatory over-inflation',
  );
  const pneumothorax = imagingComponent('pneumothorax', dated, images, span, 'pneumothorax', 'Air in the pleural space on imaging');

  // Bronchospasm.
  const wheeze = evaluateCriterion({
    id: 'new-expiratory-wheeze',
    label: 'Newly detected expiratory wheeze',
    candidates: ofKind(dated, 'auscultation'),
    span,
    qualifies: (d) => d.obs.finding === 'wheeze' && d.obs.newSinceBaseline,
    describe: (d) => `${d.obs.finding.replace(/-/g, ' ')}${d.obs.newSinceBaseline ? ' (new)' : ' (as before surgery)'} on ${d.date}`,
    threshold: 'a new wheeze',
    evidence: 'auscultation',
  });
  const firstWheeze = firstDay(dated, wheeze.observationIds);
  const bronchodilator = evaluateCriterion({
    id: 'treated-with-bronchodilator',
    label: 'Treated with bronchodilators (on or after the wheeze)',
    candidates: ofKind(dated, 'bronchodilator-given'),
    span,
    qualifies: (d) => firstWheeze !== null && d.postoperativeDay >= firstWheeze,
    describe: (d) => `bronchodilator on ${d.date}`,
    threshold: 'given on or after a new wheeze',
    evidence: 'bronchodilator',
  });
  const bothBronchospasm = atLeast('wheeze-and-treatment', 'New wheeze and bronchodilator treatment', 2, [wheeze, bronchodilator]);
  const bronchospasm = component('bronchospasm', [wheeze, bronchodilator, bothBronchospasm], bothBronchospasm, firstWheeze);

  // Aspiration pneumonitis.
  const inhalation = evaluateCriterion({
    id: 'inhalation-of-gastric-contents',
    label: 'Inhalation of gastric contents (witnessed or suctioned from the airway)',
    candidates: ofKind(dated, 'aspiration'),
    span,
    qualifies: (d) => d.obs.evidence === 'witnessed' || d.obs.evidence === 'suctioned-from-airway',
    describe: (d) => `${d.obs.evidence.replace(/-/g, ' ')} aspiration on ${d.date}`,
    threshold: 'witnessed or suctioned from the airway',
    evidence: 'aspiration',
  });
  const firstInhalation = firstDay(dated, inhalation.observationIds);
  const afterSpan: DaySpan = firstInhalation === null ? span : { start: surgery + firstInhalation, end: span.end };
  const aliImage = evaluateCriterion({
    id: 'lung-injury-imaging',
    label: 'New or progressive infiltrate or consolidation after the inhalation',
    candidates: images,
    span: afterSpan,
    qualifies: (d) => firstInhalation !== null && imageHas(d, ['infiltrate', 'consolidation'], ['new', 'progressive']),
    describe: describeImage,
    threshold: 'a new or progressive infiltrate or consolidation after the inhalation',
    evidence: 'chest imaging',
  });
  const aliPf = evaluateCriterion({
    id: 'lung-injury-oxygenation',
    label: 'PaO2/FiO2 ≤ 300 mmHg after the inhalation',
    candidates: pfs,
    span: afterSpan,
    qualifies: (d) => firstInhalation !== null && pfMmHg(d) <= T.aliPfRatioAtMostMmHg.value,
    describe: (d) => `PaO2/FiO2 ${d.obs.value} ${UNIT_LABELS[d.obs.unit]} on ${d.date}`,
    threshold: 'at most 300 mmHg after the inhalation',
    evidence: 'PaO2/FiO2',
  });
  const allAspiration = atLeast('inhalation-and-lung-injury', 'Inhalation followed by acute lung injury', 3, [inhalation, aliImage, aliPf]);
  const aspiration = component(
    'aspiration-pneumonitis',
    [inhalation, aliImage, aliPf, allAspiration],
    allAspiration,
    allAspiration.met ? Math.max(firstDay(dated, aliImage.observationIds) as number, firstDay(dated, aliPf.observationIds) as number) : null,
  );

  const components = [infection, failure, effusion, atelectasis, pneumothorax, bronchospasm, aspiration];
  return {
    definition: EPCO_DEFINITION,
    version: EPCO_VERSION,
    source: EPCO_SOURCE,
    met: components.some((c) => c.met),
    components,
  };
}
