/** Builds outcome observations for the definition tests; ids are unique per factory. */
import type {
  AuscultationFinding,
  Breathing,
  ChestImagingFinding,
  Observation,
  OxygenSupportChange,
  RespiratorySign,
  SputumColour,
} from '../../../shared/clinical/observations.js';
import type { PpcEventType } from '../../../shared/clinical/codes.js';

type When = { date: string } | { postoperativeDay: number };
const at = (when: string | number): When => (typeof when === 'string' ? { date: when } : { postoperativeDay: when });

export function observationFactory() {
  let n = 0;
  const id = (prefix: string) => `${prefix}-${++n}`;
  return {
    image: (when: string | number, findings: ChestImagingFinding[], definitive = false): Observation => ({
      id: id('img'),
      kind: 'chest-imaging',
      modality: 'radiograph',
      findings,
      definitive,
      ...at(when),
    }),
    temp: (when: string | number, value: number, unit: 'degC' | 'degF' = 'degC'): Observation => ({
      id: id('temp'),
      kind: 'temperature-max',
      value,
      unit,
      ...at(when),
    }),
    wbc: (when: string | number, value: number, unit: 'per-mm3' | '10^9/L' = 'per-mm3', which: 'lowest' | 'highest' = 'highest'): Observation => ({
      id: id('wbc'),
      kind: 'wbc',
      which,
      value,
      unit,
      ...at(when),
    }),
    pf: (when: string | number, value: number, unit: 'mmHg' | 'kPa' = 'mmHg'): Observation => ({
      id: id('pf'),
      kind: 'pf-ratio',
      value,
      unit,
      ...at(when),
    }),
    pao2: (when: string | number, value: number, unit: 'mmHg' | 'kPa', breathing: Breathing): Observation => ({
      id: id('pao2'),
      kind: 'pao2',
      value,
      unit,
      breathing,
      ...at(when),
    }),
    spo2: (when: string | number, percent: number, breathing: Breathing = 'room-air'): Observation => ({
      id: id('spo2'),
      kind: 'spo2',
      percent,
      breathing,
      ...at(when),
    }),
    oxygen: (when: string | number, change: OxygenSupportChange = 'started'): Observation => ({
      id: id('o2'),
      kind: 'supplemental-oxygen',
      change,
      ...at(when),
    }),
    sputum: (
      when: string | number,
      flags: { newPurulent?: boolean; changedCharacter?: boolean; increasedSecretionsOrSuctioning?: boolean; colour?: SputumColour },
    ): Observation => ({
      id: id('sputum'),
      kind: 'sputum',
      newPurulent: flags.newPurulent ?? false,
      changedCharacter: flags.changedCharacter ?? false,
      increasedSecretionsOrSuctioning: flags.increasedSecretionsOrSuctioning ?? false,
      ...(flags.colour ? { colour: flags.colour } : {}),
      ...at(when),
    }),
    sign: (when: string | number, sign: RespiratorySign, onset: 'new' | 'worse' = 'new'): Observation => ({
      id: id('sign'),
      kind: 'respiratory-sign',
      sign,
      onset,
      ...at(when),
    }),
    auscultation: (when: string | number, finding: AuscultationFinding, newSinceBaseline = true): Observation => ({
      id: id('ausc'),
      kind: 'auscultation',
      finding,
      newSinceBaseline,
      ...at(when),
    }),
    mental: (when: string | number, altered: boolean, otherRecognisedCause = false): Observation => ({
      id: id('mental'),
      kind: 'mental-status',
      altered,
      otherRecognisedCause,
      ...at(when),
    }),
    culture: (when: string | number, organismsGrown: boolean): Observation => ({
      id: id('culture'),
      kind: 'sputum-culture',
      organismsGrown,
      ...at(when),
    }),
    antibiotics: (
      when: string | number,
      indication: 'suspected-respiratory-infection' | 'other-infection' | 'prophylaxis' = 'suspected-respiratory-infection',
    ): Observation => ({ id: id('abx'), kind: 'antibiotics-started', indication, ...at(when) }),
    bronchodilator: (when: string | number): Observation => ({ id: id('bd'), kind: 'bronchodilator-given', ...at(when) }),
    aspiration: (when: string | number, evidence: 'witnessed' | 'suctioned-from-airway' | 'suspected' = 'witnessed'): Observation => ({
      id: id('asp'),
      kind: 'aspiration',
      evidence,
      ...at(when),
    }),
    diagnosis: (when: string | number, diagnosis: PpcEventType): Observation => ({
      id: id('dx'),
      kind: 'physician-diagnosis',
      diagnosis,
      ...at(when),
    }),
  };
}
