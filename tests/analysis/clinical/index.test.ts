/**
 * The analysis entry point exposes the clinical rules (issue 3: `ariscatScore` from
 * `analysis/index.ts`). Check value: Canet J et al., Anesthesiology 2010;113:1338-50:
 * age 72 (3) + SpO2 93% (8) + upper abdominal incision (15) + 200 min (23) = 49, high risk.
 */
import { describe, expect, it } from 'vitest';
import * as analysis from '../../../analysis/index.js';

describe('analysis entry point', () => {
  it('when ariscatScore is imported from analysis/index, then it scores as published', () => {
    expect(
      analysis.ariscatScore({
        age: 72,
        preopSpO2: 93,
        respiratoryInfectionLastMonth: false,
        preopHemoglobin: 12.5,
        incision: 'upper-abdominal',
        durationMinutes: 200,
        emergency: false,
      }),
    ).toEqual({ points: 49, riskClass: 'high' });
  });

  it('when the clinical definitions are looked up there, then each is a function', () => {
    for (const name of ['pneumoniaNhsnPnu1', 'ppcEpco', 'melbourneGroupScale', 'checkTherapyEpisode', 'predictedBodyWeight', 'lengthOfStay', 'hasAnyPpc'] as const) {
      expect(typeof analysis[name]).toBe('function');
    }
  });
});
