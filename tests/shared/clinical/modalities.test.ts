/**
 * The per-modality therapy tables: invariants, and the figures checked against their sources.
 * - PEP 10–20 cm H2O; CPAP and PAP 5–20 cm H2O: AARC CPG, Respir Care 1993 (TRADE.md);
 * - flowmeters 0–15 L/min and a 5 L/min starting flow for a PAP device: common practice (no source);
 * - incentive spirometry: volume target, no flow or pressure (issue 3);
 * - CPAP for sleep apnoea is a risk factor, not an episode (issue 3).
 */
import { describe, expect, it } from 'vitest';
import { THERAPY_MODALITIES } from '../../../shared/clinical/codes.js';
import {
  DEFAULT_THERAPY_CHECK_SETTINGS,
  MODALITY_TABLES,
  THERAPY_SOURCES,
  TherapyCheckSettingsSchema,
  fieldAppliesTo,
  modalityDefaults,
} from '../../../shared/clinical/modalities.js';

describe('modality tables', () => {
  it('when every modality is listed, then each has a table naming it', () => {
    for (const m of THERAPY_MODALITIES) expect(MODALITY_TABLES[m].modality).toBe(m);
  });

  it('when any range is given, then it has a source and the usual range lies inside the possible one', () => {
    for (const m of THERAPY_MODALITIES) {
      for (const [field, spec] of Object.entries(MODALITY_TABLES[m].numeric)) {
        expect(spec.possible.source, `${m}.${field}`).toMatch(/\S/);
        expect(spec.possible.min).toBeLessThan(spec.possible.max);
        if (spec.usual) {
          expect(spec.usual.source).toMatch(/\S/);
          expect(spec.usual.min).toBeGreaterThanOrEqual(spec.possible.min);
          expect(spec.usual.max).toBeLessThanOrEqual(spec.possible.max);
        }
        expect(MODALITY_TABLES[m].fields, `${m}.${field} has a range but is not a field`).toContain(field);
      }
    }
  });

  it('when incentive spirometry is looked up, then it has a volume target and no flow or pressure', () => {
    expect(fieldAppliesTo('incentive-spirometry', 'volumeTargetMl')).toBe(true);
    expect(fieldAppliesTo('incentive-spirometry', 'flowLpm')).toBe(false);
    expect(fieldAppliesTo('incentive-spirometry', 'expiratoryPressureCmH2O')).toBe(false);
  });

  it('when PEP, CPAP and PAP pressures are looked up, then they match AARC 1993', () => {
    const usual = (m: 'pep' | 'cpap' | 'pap-device') => MODALITY_TABLES[m].numeric.expiratoryPressureCmH2O?.usual;
    expect(usual('pep')).toMatchObject({ min: 10, max: 20, source: THERAPY_SOURCES.aarcPap1993 });
    expect(usual('cpap')).toMatchObject({ min: 5, max: 20, source: THERAPY_SOURCES.aarcPap1993 });
    expect(usual('pap-device')).toMatchObject({ min: 5, max: 20, source: THERAPY_SOURCES.aarcPap1993 });
  });

  it('when a flowmeter applies, then its possible range is 0–15 L/min', () => {
    for (const m of THERAPY_MODALITIES) {
      const flow = MODALITY_TABLES[m].numeric.flowLpm;
      if (flow) expect(flow.possible).toMatchObject({ min: 0, max: 15 });
    }
  });

  it('when a PAP device episode starts, then the form default is 5 L/min (a default, not a rule)', () => {
    expect(modalityDefaults('pap-device')).toEqual({ flowLpm: 5 });
    expect(MODALITY_TABLES['pap-device'].numeric.flowLpm?.usual).toBeUndefined();
    expect(modalityDefaults('incentive-spirometry')).toEqual({});
  });

  it('when the CPAP table is read, then it says CPAP for sleep apnoea is a risk factor, not an episode', () => {
    expect(MODALITY_TABLES.cpap.notes.join(' ')).toMatch(/sleep apnoea is a risk factor/);
  });

  it('when the settings are parsed empty, then the session-length default is 60 minutes', () => {
    expect(TherapyCheckSettingsSchema.parse({})).toEqual({ sessionLengthWarnMinutes: 60 });
    expect(DEFAULT_THERAPY_CHECK_SETTINGS.sessionLengthWarnMinutes).toBe(60);
  });
});
