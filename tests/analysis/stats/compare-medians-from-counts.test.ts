import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, compareMedians, compareMediansFromCounts, type Frequency } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

const table = fc.array(fc.record({ value: fc.integer({ min: 0, max: 40 }), count: fc.integer({ min: 0, max: 25 }) }), {
  minLength: 1,
  maxLength: 12,
});
const nonEmptyTable = table.filter((t) => t.some((r) => r.count > 0));

function expand(t: Frequency[]): number[] {
  return t.flatMap((r) => Array<number>(r.count).fill(r.value));
}

describe('compareMediansFromCounts', () => {
  describe('when checked against the permeability example of Hollander & Wolfe (1973) given as a frequency table', () => {
    it('then U = 35 and p = 0.2446, as the array form (R wilcox.test help page; W from memory)', () => {
      const x = [0.8, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46].map((value) => ({ value, count: 1 }));
      const y = [1.15, 0.88, 0.9, 0.74, 1.21].map((value) => ({ value, count: 1 }));
      const r = compareMediansFromCounts(x, y);
      expect(r.u).toBe(35);
      expectClose(r.p, 0.2446, PUBLISHED(4));
    });
  });

  describe('properties (fast-check)', () => {
    it('then the frequency-table and array forms agree on medians, U and p', () => {
      fc.assert(
        fc.property(nonEmptyTable, nonEmptyTable, (a, b) => {
          const fromCounts = compareMediansFromCounts(a, b);
          const fromArrays = compareMedians(expand(a), expand(b));
          expect(fromCounts.medianA).toBe(fromArrays.medianA);
          expect(fromCounts.medianB).toBe(fromArrays.medianB);
          expect(fromCounts.u).toBe(fromArrays.u);
          expectClose(fromCounts.p, fromArrays.p, { rel: 1e-12, abs: 1e-15 });
        }),
        { numRuns: 400 },
      );
    });

    it('then splitting a row into two rows of the same value changes nothing (SQL may return either)', () => {
      const a = [{ value: 3, count: 10 }, { value: 5, count: 4 }];
      const split = [{ value: 3, count: 6 }, { value: 5, count: 4 }, { value: 3, count: 4 }, { value: 9, count: 0 }];
      const b = [{ value: 4, count: 7 }];
      expect(compareMediansFromCounts(split, b)).toEqual(compareMediansFromCounts(a, b));
    });
  });

  describe('when the input is invalid', () => {
    it('then an empty table, counts adding up to 0, a negative or fractional count, or a non-finite value throws', () => {
      expect(() => compareMediansFromCounts([], [{ value: 1, count: 1 }])).toThrow(AnalysisInputError);
      expect(() => compareMediansFromCounts([{ value: 1, count: 0 }], [{ value: 1, count: 1 }])).toThrow(/add up to 0/);
      expect(() => compareMediansFromCounts([{ value: 1, count: -2 }], [{ value: 1, count: 1 }])).toThrow(/a\[0\]\.count/);
      expect(() => compareMediansFromCounts([{ value: 1, count: 1.5 }], [{ value: 1, count: 1 }])).toThrow(/count/);
      expect(() => compareMediansFromCounts([{ value: 1, count: 1 }], [{ value: Infinity, count: 1 }])).toThrow(/b\[0\]\.value/);
    });
  });
});
