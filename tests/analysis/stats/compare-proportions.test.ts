import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, compareProportions, type Count } from '../../../analysis/index.js';
import { expectClose, expectInterval, PUBLISHED, REFERENCE } from '../helpers.js';

const countArb = fc
  .integer({ min: 1, max: 400 })
  .chain((n) => fc.record({ events: fc.integer({ min: 0, max: n }), total: fc.constant(n) }));
const levelArb = fc.double({ min: 0.5, max: 0.999, noNaN: true });

/** Wilson limits from the score formula with z from @stdlib (independent of the module's code path). */
function wilson(x: number, n: number, z: number): [number, number] {
  const p = x / n;
  const c = p + (z * z) / (2 * n);
  const h = z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  return [x === 0 ? 0 : (c - h) / (1 + (z * z) / n), x === n ? 1 : (c + h) / (1 + (z * z) / n)];
}

describe('compareProportions', () => {
  describe('when checked against Newcombe RG, Stat Med 1998;17:873-90, table II, method 10 (hybrid score, 95%)', () => {
    it.each([
      [56, 70, 48, 80, 0.0524, 0.3339],
      [9, 10, 3, 10, 0.1705, 0.809],
      [10, 10, 0, 20, 0.6791, 1.0],
      [5, 56, 0, 29, -0.0381, 0.1926],
    ])('then %i/%i - %i/%i has limits %f to %f', (x1, n1, x2, n2, lower, upper) => {
      const r = compareProportions({ events: x1, total: n1 }, { events: x2, total: n2 });
      expectInterval(r.difference, { estimate: x1 / n1 - x2 / n2, lower, upper }, PUBLISHED(4));
    });
  });

  describe('when compared with the textbook formulas and @stdlib normal quantiles', () => {
    it('then the difference follows the hybrid score construction from two Wilson intervals', () => {
      fc.assert(
        fc.property(countArb, countArb, levelArb, (a, b, level) => {
          const z = normalQuantile(1 - (1 - level) / 2, 0, 1);
          const [l1, u1] = wilson(a.events, a.total, z);
          const [l2, u2] = wilson(b.events, b.total, z);
          const p1 = a.events / a.total;
          const p2 = b.events / b.total;
          const r = compareProportions(a, b, { level }).difference;
          expectClose(r.lower, p1 - p2 - Math.sqrt((p1 - l1) ** 2 + (u2 - p2) ** 2), { abs: 1e-12 }, 'lower');
          expectClose(r.upper, p1 - p2 + Math.sqrt((u1 - p1) ** 2 + (p2 - l2) ** 2), { abs: 1e-12 }, 'upper');
        }),
        { numRuns: 300 },
      );
    });

    it('then the risk ratio is Katz and the odds ratio Woolf, on 0.5-corrected cells when any cell is 0', () => {
      fc.assert(
        fc.property(countArb, countArb, levelArb, (a, b, level) => {
          const z = normalQuantile(1 - (1 - level) / 2, 0, 1);
          const cells = [a.events, a.total - a.events, b.events, b.total - b.events];
          const [c1, c2, c3, c4] = cells.includes(0) ? cells.map((c) => c + 0.5) : cells;
          const rr = (c1 / (c1 + c2)) / (c3 / (c3 + c4));
          const seRr = Math.sqrt(1 / c1 - 1 / (c1 + c2) + 1 / c3 - 1 / (c3 + c4));
          const or = (c1 * c4) / (c2 * c3);
          const seOr = Math.sqrt(1 / c1 + 1 / c2 + 1 / c3 + 1 / c4);
          const r = compareProportions(a, b, { level });
          expectInterval(r.riskRatio, { estimate: rr, lower: rr * Math.exp(-z * seRr), upper: rr * Math.exp(z * seRr) }, REFERENCE);
          expectInterval(r.oddsRatio, { estimate: or, lower: or * Math.exp(-z * seOr), upper: or * Math.exp(z * seOr) }, REFERENCE);
        }),
        { numRuns: 300 },
      );
    });
  });

  describe('when a cell is zero', () => {
    it('then 10/10 vs 0/20 gives the corrected OR (10.5 x 20.5)/(0.5 x 0.5) = 861 and RR (10.5/11)/(0.5/21) (Haldane 1956 correction)', () => {
      const r = compareProportions({ events: 10, total: 10 }, { events: 0, total: 20 });
      expectClose(r.oddsRatio.estimate, 861);
      expectClose(r.riskRatio.estimate, 10.5 / 11 / (0.5 / 21));
      expect(Number.isFinite(r.oddsRatio.upper) && Number.isFinite(r.riskRatio.upper)).toBe(true);
    });

    it('then no events in either group gives finite corrected ratios of 1 and a difference of 0', () => {
      const r = compareProportions({ events: 0, total: 30 }, { events: 0, total: 30 });
      expectClose(r.oddsRatio.estimate, 1);
      expectClose(r.riskRatio.estimate, 1);
      expect(r.difference.estimate).toBe(0);
      expect(r.fisherP).toBe(1);
    });
  });

  describe('when checked against Fisher\'s tea-tasting experiment (Fisher RA, The Design of Experiments, 1935, ch. 2)', () => {
    it('then 3/4 vs 1/4 has two-sided p = 34/70 = 0.4857', () => {
      expectClose(compareProportions({ events: 3, total: 4 }, { events: 1, total: 4 }).fisherP, 34 / 70, PUBLISHED(4));
    });
  });

  describe('properties (fast-check)', () => {
    it('then lower <= estimate <= upper for the difference and both ratios', () => {
      fc.assert(
        fc.property(countArb, countArb, levelArb, (a, b, level) => {
          const r = compareProportions(a, b, { level });
          for (const i of [r.difference, r.riskRatio, r.oddsRatio]) {
            const slack = 1e-12 * Math.abs(i.estimate) + 1e-15; // rounding only
            expect(i.lower <= i.estimate + slack && i.estimate <= i.upper + slack).toBe(true);
          }
          expect(r.fisherP >= 0 && r.fisherP <= 1).toBe(true);
        }),
        { numRuns: 300 },
      );
    });

    it('then swapping A and B mirrors the difference, inverts the ratios and keeps the Fisher p', () => {
      fc.assert(
        fc.property(countArb, countArb, levelArb, (a: Count, b: Count, level) => {
          const ab = compareProportions(a, b, { level });
          const ba = compareProportions(b, a, { level });
          const tol = { rel: 1e-9, abs: 1e-12 };
          expectClose(ba.difference.estimate, -ab.difference.estimate, tol);
          expectClose(ba.difference.lower, -ab.difference.upper, tol);
          expectClose(ba.difference.upper, -ab.difference.lower, tol);
          for (const k of ['riskRatio', 'oddsRatio'] as const) {
            expectClose(ba[k].estimate, 1 / ab[k].estimate, tol, `${k} estimate`);
            expectClose(ba[k].lower, 1 / ab[k].upper, tol, `${k} lower`);
            expectClose(ba[k].upper, 1 / ab[k].lower, tol, `${k} upper`);
          }
          expectClose(ba.fisherP, ab.fisherP, tol, 'fisherP');
        }),
        { numRuns: 300 },
      );
    });

    it('then a higher level never narrows any of the three intervals', () => {
      fc.assert(
        fc.property(countArb, countArb, levelArb, levelArb, (a, b, l1, l2) => {
          const [lo, hi] = l1 <= l2 ? [l1, l2] : [l2, l1];
          const n = compareProportions(a, b, { level: lo });
          const w = compareProportions(a, b, { level: hi });
          for (const k of ['difference', 'riskRatio', 'oddsRatio'] as const) {
            expect(w[k].lower).toBeLessThanOrEqual(n[k].lower + 1e-12 * Math.abs(n[k].lower) + 1e-15);
            expect(w[k].upper).toBeGreaterThanOrEqual(n[k].upper - 1e-12 * Math.abs(n[k].upper) - 1e-15);
          }
        }),
        { numRuns: 200 },
      );
    });
  });

  describe('when the input is invalid', () => {
    it('then bad counts throw an AnalysisInputError that names the group and field', () => {
      expect(() => compareProportions({ events: 3, total: 2 }, { events: 1, total: 4 })).toThrow(/a\.events/);
      expect(() => compareProportions({ events: 1, total: 4 }, { events: 1, total: 0 })).toThrow(/b\.total/);
      expect(() => compareProportions({ events: -1, total: 4 }, { events: 1, total: 4 })).toThrow(AnalysisInputError);
      expect(() => compareProportions(null as unknown as Count, { events: 1, total: 4 })).toThrow(AnalysisInputError);
      expect(() => compareProportions({ events: 1, total: 4 }, { events: 1, total: 4 }, { level: 2 })).toThrow(/level/);
    });
  });
});
