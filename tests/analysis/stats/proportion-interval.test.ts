import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, proportionInterval, type ProportionMethod } from '../../../analysis/index.js';
import { BETA, expectClose, expectInterval, PUBLISHED } from '../helpers.js';

const methods: ProportionMethod[] = ['wilson', 'exact', 'jeffreys'];
const countArb = fc.integer({ min: 1, max: 2000 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n)));
const levelArb = fc.double({ min: 0.5, max: 0.9999, noNaN: true });

describe('proportionInterval', () => {
  describe('when checked against Newcombe RG, Stat Med 1998;17:857-72, table II (95%)', () => {
    it.each([
      // [x, n, lower, upper] Wilson score without continuity correction (method 3)
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ])('then Wilson %i/%i is %f to %f', (x, n, lower, upper) => {
      expectInterval(proportionInterval(x, n), { estimate: x / n, lower, upper }, PUBLISHED(4));
    });

    it.each([
      // Clopper-Pearson "exact" (method 5)
      [81, 263, 0.2527, 0.3676],
      [0, 20, 0, 0.1684],
      [1, 29, 0.0009, 0.1776],
    ])('then Clopper-Pearson %i/%i is %f to %f', (x, n, lower, upper) => {
      expectInterval(proportionInterval(x, n, { method: 'exact' }), { estimate: x / n, lower, upper }, PUBLISHED(4));
    });
  });

  describe('when compared with @stdlib beta and normal quantiles (independent library)', () => {
    it('then Clopper-Pearson limits are the Beta(x, n-x+1) and Beta(x+1, n-x) quantiles', () => {
      fc.assert(
        fc.property(countArb, levelArb, ([x, n], level) => {
          const a = 1 - level;
          const r = proportionInterval(x, n, { method: 'exact', level });
          expectClose(r.lower, x === 0 ? 0 : betaQuantile(a / 2, x, n - x + 1), BETA, 'lower');
          expectClose(r.upper, x === n ? 1 : betaQuantile(1 - a / 2, x + 1, n - x), BETA, 'upper');
        }),
        { numRuns: 300 },
      );
    });

    it('then Jeffreys limits are Beta(x + 1/2, n - x + 1/2) quantiles, 0 at x = 0 and 1 at x = n (Brown, Cai, DasGupta, Stat Sci 2001;16:101-33)', () => {
      fc.assert(
        fc.property(countArb, levelArb, ([x, n], level) => {
          const a = 1 - level;
          const r = proportionInterval(x, n, { method: 'jeffreys', level });
          expectClose(r.lower, x === 0 ? 0 : betaQuantile(a / 2, x + 0.5, n - x + 0.5), BETA, 'lower');
          expectClose(r.upper, x === n ? 1 : betaQuantile(1 - a / 2, x + 0.5, n - x + 0.5), BETA, 'upper');
        }),
        { numRuns: 300 },
      );
    });

    it('then Wilson limits solve |p - pi| = z sqrt(pi(1 - pi)/n) with z from @stdlib (Wilson EB, JASA 1927;22:209-12)', () => {
      fc.assert(
        fc.property(countArb, levelArb, ([x, n], level) => {
          const z = normalQuantile(1 - (1 - level) / 2, 0, 1);
          const p = x / n;
          const r = proportionInterval(x, n, { level });
          // each limit pi satisfies the score equation (p - pi)^2 = z^2 pi (1 - pi) / n
          for (const pi of [r.lower, r.upper]) {
            expectClose((p - pi) ** 2, (z * z * pi * (1 - pi)) / n, { abs: 1e-12, rel: 1e-8 }, `score equation at ${pi}`);
          }
        }),
        { numRuns: 300 },
      );
    });
  });

  describe('when the count is at an edge', () => {
    it('then x = 0 gives lower 0 and x = n gives upper 1 for every method', () => {
      for (const method of methods) {
        expect(proportionInterval(0, 7, { method }).lower).toBe(0);
        expect(proportionInterval(7, 7, { method }).upper).toBe(1);
        expect(proportionInterval(7, 7, { method }).estimate).toBe(1);
      }
    });

    it('then Clopper-Pearson 0/n has upper 1 - (alpha/2)^(1/n) (closed form, Clopper & Pearson, Biometrika 1934)', () => {
      expectClose(proportionInterval(0, 20, { method: 'exact' }).upper, 1 - 0.025 ** (1 / 20));
      expectClose(proportionInterval(20, 20, { method: 'exact' }).lower, 0.025 ** (1 / 20));
    });

    it('then a single case (n = 1) gives a valid interval', () => {
      for (const method of methods) {
        const r = proportionInterval(1, 1, { method });
        expect(r.upper).toBe(1);
        expect(r.lower).toBeGreaterThan(0);
      }
    });
  });

  describe('properties (fast-check)', () => {
    it('then lower <= estimate <= upper within [0, 1]', () => {
      fc.assert(
        fc.property(countArb, levelArb, fc.constantFrom(...methods), ([x, n], level, method) => {
          const r = proportionInterval(x, n, { method, level });
          expect(0 <= r.lower && r.lower <= r.estimate && r.estimate <= r.upper && r.upper <= 1).toBe(true);
        }),
        { numRuns: 500 },
      );
    });

    it('then a higher level never narrows the interval', () => {
      fc.assert(
        fc.property(countArb, levelArb, levelArb, fc.constantFrom(...methods), ([x, n], l1, l2, method) => {
          const [lo, hi] = l1 <= l2 ? [l1, l2] : [l2, l1];
          const narrow = proportionInterval(x, n, { method, level: lo });
          const wide = proportionInterval(x, n, { method, level: hi });
          expect(wide.lower).toBeLessThanOrEqual(narrow.lower + 1e-12);
          expect(wide.upper).toBeGreaterThanOrEqual(narrow.upper - 1e-12);
        }),
        { numRuns: 300 },
      );
    });
  });

  describe('when the input is invalid', () => {
    it.each([
      [-1, 10, 'events'],
      [11, 10, 'events'],
      [1.5, 10, 'events'],
      [0, 0, 'total'],
      [Number.NaN, 10, 'events'],
      [1, Number.POSITIVE_INFINITY, 'total'],
    ])('then (%s, %s) throws an AnalysisInputError naming %s', (x, n, field) => {
      expect(() => proportionInterval(x, n)).toThrow(AnalysisInputError);
      expect(() => proportionInterval(x, n)).toThrow(field);
    });

    it('then an unknown method or a level outside (0, 1) throws', () => {
      expect(() => proportionInterval(1, 10, { method: 'wald' as ProportionMethod })).toThrow(/method/);
      expect(() => proportionInterval(1, 10, { level: 1 })).toThrow(/level/);
      expect(() => proportionInterval(1, 10, { level: 95 })).toThrow(AnalysisInputError);
    });
  });
});
