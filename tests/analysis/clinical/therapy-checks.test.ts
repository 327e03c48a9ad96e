/**
 * Therapy episode checks. Figures and their sources:
 * - PEP and threshold resistors usually 10–20 cm H2O; CPAP and positive-airway-pressure
 *   devices usually 5–20 cm H2O: AARC Clinical Practice Guideline, use of positive airway
 *   pressure adjuncts to bronchial hygiene therapy, Respir Care 1993 (TRADE.md);
 * - hospital flowmeters read 0–15 L/min: common practice (no source);
 * - a session longer than 60 minutes (the configurable default) is not intermittent therapy:
 *   common practice (no source);
 * - incentive spirometry has a volume target and no flow or pressure (issue 3; AARC IS CPG 2011);
 * - the 30 cm H2O possible ceiling is our own (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { checkTherapyEpisode } from '../../../analysis/clinical/therapy-checks.js';
import { AnalysisInputError } from '../../../analysis/errors.js';
import { CLINICAL_CAUTION } from '../../../shared/clinical/checks.js';
import type { TherapyEpisodeCheckInput } from '../../../shared/clinical/modalities.js';

const check = (e: Partial<TherapyEpisodeCheckInput> & Pick<TherapyEpisodeCheckInput, 'modality'>, settings?: { sessionLengthWarnMinutes: number }) =>
  checkTherapyEpisode(e as TherapyEpisodeCheckInput, settings);

describe('checkTherapyEpisode pressure ranges', () => {
  it.each([
    [10, 0],
    [20, 0],
    [9, 1],
    [21, 1],
  ])('when PEP reaches %s cm H2O, then %i warnings (usual 10–20, AARC 1993)', (p, n) => {
    const r = check({ modality: 'pep', expiratoryPressureCmH2O: p });
    expect(r.errors).toEqual([]);
    expect(r.warnings).toHaveLength(n);
  });

  it.each(['cpap', 'pap-device'] as const)('when %s is at 4, 5, 20 and 21 cm H2O, then only 4 and 21 warn (usual 5–20, AARC 1993)', (modality) => {
    const warns = [4, 5, 20, 21].map((p) => check({ modality, expiratoryPressureCmH2O: p }).warnings.length);
    expect(warns).toEqual([1, 0, 0, 1]);
  });

  it.each([-1, 31])('when the pressure is %s cm H2O, then it is rejected as impossible with a hint', (p) => {
    const r = check({ modality: 'cpap', expiratoryPressureCmH2O: p });
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0].path).toBe('expiratoryPressureCmH2O');
    expect(r.errors[0].hint).toMatch(/0 to 30 cm H2O/);
    expect(r.warnings).toEqual([]);
  });
});

describe('checkTherapyEpisode flowmeter (0–15 L/min, common practice)', () => {
  it.each([
    [0, 0],
    [5, 0],
    [15, 0],
    [15.5, 1],
    [-1, 1],
  ])('when a PAP device flow is %s L/min, then %i errors', (flow, n) => {
    expect(check({ modality: 'pap-device', flowLpm: flow }).errors).toHaveLength(n);
  });

  it('when incentive spirometry carries a flow or a pressure, then each is rejected: it has a volume target only', () => {
    const r = check({ modality: 'incentive-spirometry', flowLpm: 5, expiratoryPressureCmH2O: 10, volumeTargetMl: 1500 });
    expect(r.errors.map((e) => e.path).sort()).toEqual(['expiratoryPressureCmH2O', 'flowLpm']);
    expect(r.errors[0].hint).toMatch(/volume target/);
  });

  it('when incentive spirometry is used with a mask, then the interface is rejected', () => {
    expect(check({ modality: 'incentive-spirometry', interface: 'mask' }).errors.map((e) => e.path)).toEqual(['interface']);
  });
});

describe('checkTherapyEpisode session length', () => {
  it.each([
    [60, 0],
    [61, 1],
  ])('when a CPAP session lasts %s min with the default 60, then %i warnings', (minutes, n) => {
    expect(check({ modality: 'cpap', sessionMinutes: minutes }).warnings).toHaveLength(n);
  });

  it('when the network sets 30 minutes, then a 45-minute session warns', () => {
    const r = check({ modality: 'pep', sessionMinutes: 45 }, { sessionLengthWarnMinutes: 30 });
    expect(r.warnings.map((w) => w.path)).toEqual(['sessionMinutes']);
  });

  it('when early mobilisation lasts 90 minutes, then no warning (no session-length rule for walking)', () => {
    expect(check({ modality: 'early-mobilisation', sessionMinutes: 90 }).warnings).toEqual([]);
  });

  it('when the settings are invalid, then it throws', () => {
    expect(() => check({ modality: 'pep' }, { sessionLengthWarnMinutes: -5 })).toThrow(AnalysisInputError);
  });
});

describe('checkTherapyEpisode warnings carry the caution', () => {
  it('when several warnings arise, then every one carries the caution text', () => {
    const r = check({ modality: 'cpap', expiratoryPressureCmH2O: 25, sessionMinutes: 120 });
    expect(r.warnings).toHaveLength(2);
    for (const w of r.warnings) {
      expect(w.caution).toBe("Local protocol and the clinician's judgement decide; Alveolog supports surveillance, not bedside decisions.");
      expect(w.message).toContain(CLINICAL_CAUTION);
      expect(w.message.startsWith(w.detail)).toBe(true);
    }
  });
});

describe('checkTherapyEpisode other rules', () => {
  it('when more sessions are delivered than prescribed without a reason, then an error', () => {
    const r = check({ modality: 'incentive-spirometry', sessionsPrescribed: 10, sessionsDelivered: 12 });
    expect(r.errors.map((e) => e.path)).toEqual(['sessionsDelivered']);
    expect(r.errors[0].hint).toMatch(/reason/);
  });

  it('when the extra sessions have a reason, then accepted', () => {
    const r = check({ modality: 'incentive-spirometry', sessionsPrescribed: 10, sessionsDelivered: 12, deliveredAbovePrescribedReason: 'extra sessions at the patient’s request' });
    expect(r.errors).toEqual([]);
  });

  it('when a count is fractional or a value is not a number, then an error names the field', () => {
    const r = check({ modality: 'pep', sessionsDelivered: 2.5, expiratoryPressureCmH2O: '12' as unknown as number });
    expect(r.errors.map((e) => e.path).sort()).toEqual(['expiratoryPressureCmH2O', 'sessionsDelivered']);
  });

  it('when the modality is unknown, then an error on modality', () => {
    const r = check({ modality: 'yoga' as TherapyEpisodeCheckInput['modality'] });
    expect(r.errors.map((e) => e.path)).toEqual(['modality']);
  });

  it('when a complete, usual PAP episode is checked, then nothing is reported', () => {
    const r = check({
      modality: 'pap-device',
      startPostoperativeDay: 1,
      sessionsPrescribed: 12,
      sessionsDelivered: 10,
      sessionMinutes: 15,
      interface: 'mask',
      aerosolMedication: false,
      sourceGas: 'air',
      flowLpm: 5,
      expiratoryPressureCmH2O: 10,
      inspiratoryCapacityMl: 900,
      predictedBodyWeightKg: 61.6,
    });
    expect(r).toEqual({ errors: [], warnings: [] });
  });

  it('when null is stored for unused settings, then they are ignored', () => {
    expect(check({ modality: 'incentive-spirometry', flowLpm: null, expiratoryPressureCmH2O: null })).toEqual({ errors: [], warnings: [] });
  });

  it('when the episode is missing, then it throws', () => {
    expect(() => checkTherapyEpisode(undefined as unknown as TherapyEpisodeCheckInput)).toThrow(AnalysisInputError);
  });
});
