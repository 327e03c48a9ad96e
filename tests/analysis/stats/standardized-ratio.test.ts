import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, standardizedRatio } from '../../../analysis/index.js';
import { expectClose, expectInterval, PUBLISHED, REFERENCE } from '../helpers.js';

describe('standardizedRatio', () => {
  describe('when checked against the exact Poisson limits tabulated by Ulm K, Am J Epidemiol 1990;131:373-5 (95%)', () => {
    it('then O = 10, E = 8 gives 1.25 with limits 4.795/8 to 18.39/8', () => {
      expectInterval(standardizedRatio(10, 8), { estimate: 1.25, lower: 4.795 / 8, upper: 18.39 / 8 }, PUBLISHED(3));
    });

    it('then O = 25, E = 25 gives 1 with limits 0.647 to 1.476 (16.18/25 and 36.90/25)', () => {
      expectInterval(standardizedRatio(25, 25), { estimate: 1, lower: 16.18 / 25, upper: 36.9 / 25 }, PUBLISHED(3));
    });

    it('then O = 0 gives 0 with limits 0 to 3.689 / E', () => {
      const r = standardizedRatio(0, 2.5);
      expect(r.estimate).toBe(0);
      expect(r.lower).toBe(0);
      expectClose(r.upper, 3.689 / 2.5, PUBLISHED(3));
    });
  });

  describe('when compared with @stdlib chi-square quantiles (independent library)', () => {
    it('then the limits are the Garwood limits of O divided by E', () => {
      fc.assert(
        fc.property(
          fc.integer({ min: 0, max: 900 }),
          fc.double({ min: 0.01, max: 3000, noNaN: true }),
          fc.double({ min: 0.5, max: 0.9999, noNaN: true }),
          (o, e, level) => {
            const a = 1 - level;
            fc.pre(chisquareQuantile(1 - a / 2, 2 * o + 2) < 1900); // where @stdlib is reliable (see rate-interval.test.ts)
            const r = standardizedRatio(o, e, { level });
            expectClose(r.estimate, o / e, REFERENCE, 'estimate');
            expectClose(r.lower, o === 0 ? 0 : chisquareQuantile(a / 2, 2 * o) / 2 / e, REFERENCE, 'lower');
            expectClose(r.upper, chisquareQuantile(1 - a / 2, 2 * o + 2) / 2 / e, REFERENCE, 'upper');
            expect(r.lower <= r.estimate && r.estimate <= r.upper).toBe(true);
          },
        ),
        { numRuns: 300 },
      );
    });
  });

  describe('when the input is invalid', () => {
    it('then a negative or fractional observed count, or an expected count <= 0, throws', () => {
      expect(() => standardizedRatio(-1, 3)).toThrow(AnalysisInputError);
      expect(() => standardizedRatio(2.5, 3)).toThrow(/observed/);
      expect(() => standardizedRatio(2, 0)).toThrow(/expected/);
      expect(() => standardizedRatio(2, Number.POSITIVE_INFINITY)).toThrow(/expected/);
    });
  });
});
