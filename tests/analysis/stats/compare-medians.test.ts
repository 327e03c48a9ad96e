import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, compareMedians } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

/**
 * Independent Mann-Whitney: U by counting pairs (a > b counts 1, a = b counts 1/2), the tie-corrected
 * variance from the tie groups of the pooled sample, continuity correction 1/2, p from @stdlib's
 * normal cdf (Mann & Whitney, Ann Math Stat 1947;18:50-60; Hollander & Wolfe, Nonparametric
 * Statistical Methods, 2nd ed. 1999, sec. 4.1).
 */
function referenceMannWhitney(a: number[], b: number[]): { u: number; p: number } {
  let u = 0;
  for (const x of a) for (const y of b) u += x > y ? 1 : x === y ? 0.5 : 0;
  const n1 = a.length;
  const n2 = b.length;
  const n = n1 + n2;
  const groups = new Map<number, number>();
  for (const v of [...a, ...b]) groups.set(v, (groups.get(v) ?? 0) + 1);
  let ties = 0;
  for (const t of groups.values()) ties += t ** 3 - t;
  const sigma = Math.sqrt(((n1 * n2) / 12) * (n + 1 - ties / (n * (n - 1))));
  if (sigma === 0) return { u, p: 1 };
  const d = u - (n1 * n2) / 2;
  const z = (Math.abs(d) - 0.5 * (d === 0 ? 0 : 1)) / sigma;
  return { u, p: Math.min(1, 2 * (1 - normalCdf(z, 0, 1))) };
}

function median(v: number[]): number {
  const s = [...v].sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

const sample = fc.array(fc.integer({ min: 0, max: 30 }), { minLength: 1, maxLength: 60 });

describe('compareMedians', () => {
  describe('when checked against the permeability example of Hollander M, Wolfe DA (1973), as in R\'s wilcox.test help page', () => {
    // x: at term, y: 12-26 weeks gestation; R prints W = 35 (from memory; the statistic is also
    // recomputed by pair counting here). Two-sided normal approximation with continuity correction:
    // z = (35 - 25 - 0.5) / sqrt(10 * 5 * 16 / 12) = 1.1635, p = 0.2446.
    const x = [0.8, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46];
    const y = [1.15, 0.88, 0.9, 0.74, 1.21];
    it('then U = 35, p = 0.2446, medians 1.415 and 0.90', () => {
      const r = compareMedians(x, y);
      expect(r.u).toBe(35);
      expect(referenceMannWhitney(x, y).u).toBe(35);
      expectClose(r.p, 0.2446, PUBLISHED(4));
      expectClose(r.medianA, 1.415, { abs: 1e-12 });
      expectClose(r.medianB, 0.9, { abs: 1e-12 });
    });
  });

  describe('when compared with an independent pair-counting implementation', () => {
    it('then U and p agree on random samples with many ties', () => {
      fc.assert(
        fc.property(sample, sample, (a, b) => {
          const r = compareMedians(a, b);
          const ref = referenceMannWhitney(a, b);
          expect(r.u).toBe(ref.u);
          expectClose(r.p, ref.p, { rel: 1e-9, abs: 1e-12 }, 'p');
          expect(r.medianA).toBe(median(a));
          expect(r.medianB).toBe(median(b));
        }),
        { numRuns: 400 },
      );
    });

    it('then U(a, b) + U(b, a) = nA nB and the p is the same both ways', () => {
      fc.assert(
        fc.property(sample, sample, (a, b) => {
          const ab = compareMedians(a, b);
          const ba = compareMedians(b, a);
          expect(ab.u + ba.u).toBe(a.length * b.length);
          expectClose(ab.p, ba.p, { rel: 1e-12, abs: 1e-15 });
        }),
      );
    });
  });

  describe('when the samples are degenerate', () => {
    it('then all values tied gives U = nA nB / 2 and p = 1 (the permutation distribution is one point)', () => {
      const r = compareMedians([3, 3, 3], [3, 3]);
      expect(r.u).toBe(3);
      expect(r.p).toBe(1);
    });

    it('then one value each gives a valid p', () => {
      const r = compareMedians([1], [2]);
      expect(r.u).toBe(0);
      expect(r.p).toBe(1); // |U - 1/2| - 1/2 = 0: z = 0
    });
  });

  describe('when the input is invalid', () => {
    it('then an empty sample or a non-finite value throws AnalysisInputError', () => {
      expect(() => compareMedians([], [1])).toThrow(AnalysisInputError);
      expect(() => compareMedians([1], [])).toThrow(/b must not be empty/);
      expect(() => compareMedians([1, Number.NaN], [1])).toThrow(/a\[1\]/);
    });
  });
});
