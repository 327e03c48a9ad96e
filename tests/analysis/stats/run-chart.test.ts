import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, runChart } from '../../../analysis/index.js';

/** qbinom(0.05, m, 1/2) by exact BigInt sums: the smallest k with sum_{j<=k} C(m, j) >= 0.05 * 2^m. */
function exactCrossingsLimit(m: number): number {
  const total = 1n << BigInt(m);
  let c = 1n;
  let sum = 0n;
  for (let k = 0; ; k += 1) {
    sum += c;
    if (sum * 20n >= total) return k;
    c = (c * BigInt(m - k)) / BigInt(k + 1);
  }
}

describe('runChart', () => {
  describe('when applying the rules of Perla RJ, Provost LP, Murray SK, BMJ Qual Saf 2011;20:46-51', () => {
    it('then six points above and six below the median are two shifts with one crossing', () => {
      const r = runChart([5, 5, 5, 5, 5, 5, 1, 1, 1, 1, 1, 1]);
      expect(r.median).toBe(3);
      expect(r.useful).toBe(12);
      expect(r.runs).toBe(2);
      expect(r.crossings).toBe(1);
      expect(r.longestRun).toBe(6);
      expect(r.shifts).toEqual([
        { start: 0, end: 5 },
        { start: 6, end: 11 },
      ]);
      expect(r.trends).toEqual([]);
    });

    it('then five points on one side is not yet a shift', () => {
      expect(runChart([9, 9, 9, 9, 9, 1, 1, 1, 1, 1]).shifts).toEqual([]);
    });

    it('then points on the median neither break nor extend a run, nulls are skipped, and indices point into values', () => {
      // baseline median of [1, 3, 2, 2] is 2; indices 2, 3 and 7 lie on it, index 4 is missing
      const r = runChart([1, 3, 2, 2, null, 5, 6, 2, 7, 8, 9, 4], { baseline: 4 });
      expect(r.median).toBe(2);
      expect(r.useful).toBe(8);
      expect(r.runs).toBe(2);
      expect(r.longestRun).toBe(7);
      expect(r.crossings).toBe(1);
      expect(r.shifts).toEqual([{ start: 1, end: 11 }]);
    });

    it('then five falling points with equal neighbours counted once are a trend from where the fall starts to where it stops', () => {
      // groups 5 | 4 4 | 3 | 2 | 1 1 | 6: five distinct falling steps
      expect(runChart([5, 4, 4, 3, 2, 1, 1, 6]).trends).toEqual([{ start: 0, end: 5 }]);
      // a plateau at the start: the rise starts at its last point
      expect(runChart([3, 3, 4, 5, 6, 7]).trends).toEqual([{ start: 1, end: 5 }]);
    });

    it('then four distinct rising values among five points are not a trend (like values do not make a trend)', () => {
      expect(runChart([1, 2, 2, 3, 4]).trends).toEqual([]);
      expect(runChart([1, 2, 3, 4, 5]).trends).toEqual([{ start: 0, end: 4 }]);
    });

    it('then a trend is read across missing months', () => {
      expect(runChart([1, null, 2, 3, null, 4, 5]).trends).toEqual([{ start: 0, end: 6 }]);
    });
  });

  describe('when computing the limits of Anhøj J, Olesen AV, PLoS One 2014;9:e113825', () => {
    it('then the longest-run limit is round(log2(n) + 3) and the crossings limit qbinom(0.05, n - 1, 0.5), n = useful points', () => {
      fc.assert(
        fc.property(fc.array(fc.integer({ min: 0, max: 20 }), { minLength: 1, maxLength: 120 }), (values) => {
          const r = runChart(values);
          if (r.useful === 0) {
            expect(r.longestRunLimit).toBeNull();
            expect(r.crossingsLimit).toBeNull();
          } else {
            expect(r.longestRunLimit).toBe(Math.round(Math.log2(r.useful) + 3));
            expect(r.crossingsLimit).toBe(exactCrossingsLimit(r.useful - 1));
          }
          expect(r.crossings).toBe(Math.max(0, r.runs - 1));
        }),
        { numRuns: 300 },
      );
    });

    it('then for 10 and 20 useful points the limits are 6 and 2, and 7 and 6 (Anhøj & Olesen 2014, table; from memory, recomputed here)', () => {
      const ten = runChart([1, 9, 1, 9, 1, 9, 1, 9, 1, 9]);
      expect([ten.useful, ten.longestRunLimit, ten.crossingsLimit]).toEqual([10, 6, exactCrossingsLimit(9)]);
      expect(exactCrossingsLimit(9)).toBe(2);
      const twenty = runChart(Array.from({ length: 20 }, (_, i) => (i % 2 ? 9 : 1)));
      expect([twenty.useful, twenty.longestRunLimit, twenty.crossingsLimit]).toEqual([20, 7, 6]);
    });
  });

  describe('when the series is degenerate', () => {
    it('then a single point is on its own median: no useful point, null limits', () => {
      const r = runChart([4]);
      expect(r).toEqual({
        median: 4,
        useful: 0,
        runs: 0,
        longestRun: 0,
        longestRunLimit: null,
        crossings: 0,
        crossingsLimit: null,
        shifts: [],
        trends: [],
      });
    });
  });

  describe('properties (fast-check)', () => {
    it('then shifting every value by an integer constant changes only the median, by that constant', () => {
      fc.assert(
        fc.property(
          fc.array(fc.option(fc.integer({ min: -1000, max: 1000 }), { nil: null }), { minLength: 1, maxLength: 80 }),
          fc.integer({ min: -10_000, max: 10_000 }),
          fc.integer({ min: 1, max: 80 }),
          (values, k, b) => {
            const present = values.filter((v) => v !== null).length;
            fc.pre(present > 0);
            const baseline = Math.min(b, present);
            const r = runChart(values, { baseline });
            const s = runChart(values.map((v) => (v === null ? null : v + k)), { baseline });
            expect(s.median).toBe(r.median + k);
            expect({ ...s, median: 0 }).toEqual({ ...r, median: 0 });
          },
        ),
        { numRuns: 300 },
      );
    });

    it('then runs partition the useful points: longestRun <= useful and every shift is at least six useful points', () => {
      fc.assert(
        fc.property(fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 1, maxLength: 60 }), (values) => {
          const r = runChart(values);
          expect(r.longestRun).toBeLessThanOrEqual(r.useful);
          for (const s of r.shifts) {
            const seg = values.slice(s.start, s.end + 1).filter((v) => v !== r.median);
            expect(seg.length).toBeGreaterThanOrEqual(6);
            expect(seg.every((v) => v > r.median) || seg.every((v) => v < r.median)).toBe(true);
          }
        }),
      );
    });
  });

  describe('when the input is invalid', () => {
    it('then no non-null point, a non-finite value or a baseline out of range throws AnalysisInputError', () => {
      expect(() => runChart([])).toThrow(AnalysisInputError);
      expect(() => runChart([null, null])).toThrow(/no non-null value/);
      expect(() => runChart([1, Number.NaN])).toThrow(/values\[1\]/);
      expect(() => runChart([1, 2, 3], { baseline: 4 })).toThrow(/baseline/);
      expect(() => runChart([1, 2, 3], { baseline: 0 })).toThrow(/baseline/);
      expect(() => runChart([1, 2, 3], { baseline: 1.5 })).toThrow(/baseline/);
    });
  });
});
