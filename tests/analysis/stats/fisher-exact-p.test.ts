import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, fisherExactP } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

/**
 * Independent two-sided Fisher p by exact rational arithmetic: every table with the observed margins
 * is enumerated, its probability C(n1, x) C(n2, k - x) / C(N, k) kept as a BigInt numerator, and the
 * tables with numerator <= the observed one are summed (ties are exact here, so no tolerance is
 * needed; R's fisher.test reaches the same set with its 1 + 1e-7 relative tolerance).
 */
function exactFisher(x1: number, n1: number, x2: number, n2: number): number {
  const choose = (n: number, k: number): bigint => {
    if (k < 0 || k > n) return 0n;
    let c = 1n;
    for (let j = 0; j < k; j += 1) c = (c * BigInt(n - j)) / BigInt(j + 1);
    return c;
  };
  const k = x1 + x2;
  const weight = (x: number) => choose(n1, x) * choose(n2, k - x);
  const observed = weight(x1);
  let tail = 0n;
  let all = 0n;
  for (let x = Math.max(0, k - n2); x <= Math.min(k, n1); x += 1) {
    const w = weight(x);
    all += w;
    if (w <= observed) tail += w;
  }
  return bigRatio(tail, all);
}

/** numerator / denominator as a double, to full precision however small the ratio. */
function bigRatio(numerator: bigint, denominator: bigint): number {
  const bits = (v: bigint) => v.toString(2).length;
  const k = Math.max(0, bits(denominator) - bits(numerator) + 64);
  const q = Number((numerator << BigInt(k)) / denominator);
  return q * 2 ** -Math.min(k, 1000) * 2 ** -(k - Math.min(k, 1000));
}

describe('fisherExactP', () => {
  describe('when checked against published examples', () => {
    it('then the tea-tasting table 3/1/1/3 gives two-sided p = 0.4857 (Fisher RA, The Design of Experiments, 1935, ch. 2: 34/70)', () => {
      expectClose(fisherExactP({ events: 3, total: 4 }, { events: 1, total: 4 }), 0.4857, PUBLISHED(4));
    });

    it('then the all-or-none tea table 4/0/0/4 gives 2/70 = 0.02857 (Fisher 1935: one-sided 1/70, doubled by symmetry)', () => {
      expectClose(fisherExactP({ events: 4, total: 4 }, { events: 0, total: 4 }), 2 / 70, { rel: 1e-12 });
    });
  });

  describe('when compared with an exact BigInt enumeration of all tables', () => {
    it('then the p agrees to 1e-9 relative on random tables', () => {
      fc.assert(
        fc.property(
          fc.integer({ min: 1, max: 120 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n))),
          fc.integer({ min: 1, max: 120 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n))),
          ([x1, n1], [x2, n2]) => {
            expectClose(fisherExactP({ events: x1, total: n1 }, { events: x2, total: n2 }), exactFisher(x1, n1, x2, n2), { rel: 1e-9, abs: 1e-300 });
          },
        ),
        { numRuns: 300 },
      );
    });

    it('then symmetric tables, where ties between tables are exact, are counted fully (e.g. 5/10 vs 5/10 gives 1)', () => {
      expect(fisherExactP({ events: 5, total: 10 }, { events: 5, total: 10 })).toBeCloseTo(1, 12);
      expectClose(fisherExactP({ events: 7, total: 10 }, { events: 3, total: 10 }), exactFisher(7, 10, 3, 10), { rel: 1e-12 });
    });
  });

  describe('when the table is degenerate', () => {
    it('then no events at all, or all events, gives p = 1', () => {
      expect(fisherExactP({ events: 0, total: 5 }, { events: 0, total: 9 })).toBe(1);
      expect(fisherExactP({ events: 5, total: 5 }, { events: 9, total: 9 })).toBeCloseTo(1, 12);
    });
  });

  describe('when the input is invalid', () => {
    it('then events above total or a zero total throws', () => {
      expect(() => fisherExactP({ events: 5, total: 4 }, { events: 0, total: 4 })).toThrow(AnalysisInputError);
      expect(() => fisherExactP({ events: 0, total: 0 }, { events: 0, total: 4 })).toThrow(/a\.total/);
    });
  });
});
