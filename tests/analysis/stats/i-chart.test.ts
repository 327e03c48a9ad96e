import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { AnalysisInputError, iChart } from '../../../analysis/index.js';
import { expectClose } from '../helpers.js';

// Individuals chart: centre = mean, limits mean +- 2.66 MRbar (2.66 = 3 / d2, d2 = 1.128 for n = 2:
// Montgomery DC, Introduction to Statistical Quality Control, sec. 6.4, table VI; Provost & Murray,
// The Health Care Data Guide, 2011, ch. 7).
describe('iChart', () => {
  it('when the series is 10, 12, 11, 13, then the centre is 11.5, MRbar (2 + 1 + 2)/3 and limits 11.5 +- 2.66 MRbar', () => {
    const chart = iChart([10, 12, 11, 13]);
    expectClose(chart.centre, 11.5);
    expectClose(chart.movingRangeMean, 5 / 3);
    expectClose(chart.points[0].lower, 11.5 - (2.66 * 5) / 3);
    expectClose(chart.points[0].upper, 11.5 + (2.66 * 5) / 3);
  });

  it('when 2.66 is compared with 3 / d2, d2 = 1.128 (Montgomery, table VI), then they agree to the published 3 figures', () => {
    expectClose(3 / 1.128, 2.66, { abs: 0.005 });
  });

  it('when a baseline is given, then later points are judged against it', () => {
    const chart = iChart([5, 6, 5, 6, 5, 6, 20], { baseline: 6 });
    expectClose(chart.centre, 5.5);
    expectClose(chart.movingRangeMean, 1);
    expect(chart.points[6].outside).toBe(true);
    expect(chart.signals).toContainEqual({ rule: 'outside-3-sigma', start: 6, end: 6 });
  });

  it('when the baseline is a single point, then MRbar and the limits are null and nothing is outside', () => {
    const chart = iChart([4, 9, 9], { baseline: 1 });
    expect(chart.movingRangeMean).toBeNull();
    expect(chart.points.every((p) => p.lower === null && p.upper === null && !p.outside)).toBe(true);
  });

  it('properties: shifting the series by a constant shifts centre and limits by it', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -100, max: 100 }), { minLength: 2, maxLength: 40 }), fc.integer({ min: -50, max: 50 }), (v, k) => {
        const a = iChart(v);
        const b = iChart(v.map((x) => x + k));
        expectClose(b.centre, a.centre + k, { abs: 1e-9 });
        expectClose(b.points[0].upper, (a.points[0].upper as number) + k, { abs: 1e-9 });
        expectClose(b.movingRangeMean, a.movingRangeMean as number, { abs: 1e-9 });
      }),
    );
  });

  it('when the input is invalid, then it throws AnalysisInputError', () => {
    expect(() => iChart([])).toThrow(AnalysisInputError);
    expect(() => iChart([1, Number.POSITIVE_INFINITY])).toThrow(/values\[1\]/);
  });
});
