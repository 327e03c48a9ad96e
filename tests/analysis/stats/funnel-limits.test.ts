import binomialCdf from '@stdlib/stats-base-dists-binomial-cdf';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, funnelLimits } from '../../../analysis/index.js';
import { expectClose } from '../helpers.js';

/**
 * Spiegelhalter DJ, Stat Med 2005;24:1185-1202, appendix A.1.1, computed independently with exact
 * rational arithmetic for a target a/b: P(R <= r) = sum_k C(n, k) a^k (b - a)^(n - k) / b^n,
 * r_p the smallest r with P(R <= r) >= p, alpha = (P(R <= r_p) - p) / P(R = r_p), limit (r_p - alpha)/n,
 * clamped to [0, 1].
 */
function referenceLimit(a: number, b: number, n: number, p: number): number {
  const A = BigInt(a);
  const B = BigInt(b);
  const denom = B ** BigInt(n);
  const terms: bigint[] = [];
  let c = 1n;
  for (let k = 0; k <= n; k += 1) {
    terms.push(c * A ** BigInt(k) * (B - A) ** BigInt(n - k));
    c = (c * BigInt(n - k)) / BigInt(k + 1);
  }
  const scale = 10n ** 30n;
  const toNumber = (v: bigint) => Number((v * scale) / denom) / 1e30;
  let cum = 0n;
  for (let r = 0; r <= n; r += 1) {
    cum += terms[r];
    if (toNumber(cum) >= p) {
      const alpha = (toNumber(cum) - p) / toNumber(terms[r]);
      return Math.min(1, Math.max(0, (r - alpha) / n));
    }
  }
  return 1;
}

describe('funnelLimits', () => {
  describe('when compared with an exact rational computation of Spiegelhalter\'s interpolated binomial limits', () => {
    it('then limits agree to 1e-9 for targets a/b and sizes up to 300', () => {
      fc.assert(
        fc.property(
          fc.integer({ min: 2, max: 50 }).chain((b) => fc.tuple(fc.integer({ min: 1, max: b - 1 }), fc.constant(b))),
          fc.integer({ min: 1, max: 300 }),
          fc.constantFrom(0.8, 0.9, 0.95, 0.99, 0.998),
          ([a, b], n, level) => {
            const [point] = funnelLimits(a / b, [n], { levels: [level] });
            expect(point.size).toBe(n);
            expectClose(point.limits[0].lower, referenceLimit(a, b, n, (1 - level) / 2), { abs: 1e-9 }, 'lower');
            expectClose(point.limits[0].upper, referenceLimit(a, b, n, (1 + level) / 2), { abs: 1e-9 }, 'upper');
          },
        ),
        { numRuns: 150 },
      );
    });
  });

  describe('when the unit is large', () => {
    // Sites of a network hold up to a few hundred thousand cases; the same definition with
    // @stdlib's binomial cdf and pmf (an independent library), r_p found by bisection.
    it('then limits at sizes up to 200,000 agree with @stdlib\'s binomial cdf and pmf to 1e-9', () => {
      const reference = (t: number, n: number, p: number) => {
        let lo = 0;
        let hi = n;
        while (lo < hi) { const mid = Math.floor((lo + hi) / 2); if (binomialCdf(mid, n, t) >= p * (1 - 64 * Number.EPSILON)) hi = mid; else lo = mid + 1; }
        return Math.min(1, Math.max(0, (lo - (binomialCdf(lo, n, t) - p) / binomialPmf(lo, n, t)) / n));
      };
      for (const t of [0.003, 0.0814, 0.17, 0.5, 0.93]) {
        const sizes = [1500, 20000, 87654, 200000];
        funnelLimits(t, sizes).forEach((point, i) => {
          for (const { level, lower, upper } of point.limits) {
            expectClose(lower, reference(t, sizes[i], (1 - level) / 2), { abs: 1e-9 }, `lower, target ${t}, size ${sizes[i]}, level ${level}`);
            expectClose(upper, reference(t, sizes[i], (1 + level) / 2), { abs: 1e-9 }, `upper, target ${t}, size ${sizes[i]}, level ${level}`);
          }
        });
      }
    });

    it('then the limits approach the normal funnel target -+ z sqrt(target(1 - target)/n) (Spiegelhalter 2005, eq. for the normal approximation)', () => {
      const target = 0.1;
      const n = 20000;
      const [point] = funnelLimits(target, [n]);
      for (const { level, lower, upper } of point.limits) {
        const half = normalQuantile((1 + level) / 2, 0, 1) * Math.sqrt((target * (1 - target)) / n);
        expectClose(lower, target - half, { rel: 5e-3 });
        expectClose(upper, target + half, { rel: 5e-3 });
      }
    });
  });

  describe('properties (fast-check)', () => {
    it('then 0 <= lower <= upper <= 1, and the 99.8% funnel contains the 95% funnel (default levels)', () => {
      fc.assert(
        fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.array(fc.integer({ min: 1, max: 3000 }), { minLength: 1, maxLength: 5 }), (t, sizes) => {
          const out = funnelLimits(t, sizes);
          expect(out.map((p) => p.size)).toEqual(sizes);
          for (const p of out) {
            const [l95, l998] = p.limits;
            expect([l95.level, l998.level]).toEqual([0.95, 0.998]);
            for (const l of p.limits) expect(0 <= l.lower && l.lower <= l.upper && l.upper <= 1).toBe(true);
            expect(l998.lower <= l95.lower + 1e-12 && l998.upper >= l95.upper - 1e-12).toBe(true);
          }
        }),
        { numRuns: 150 },
      );
    });
  });

  describe('when the target is at an edge', () => {
    it('then a target of 0 or 1 gives limits equal to the target', () => {
      expect(funnelLimits(0, [10])[0].limits.every((l) => l.lower === 0 && l.upper === 0)).toBe(true);
      expect(funnelLimits(1, [10])[0].limits.every((l) => l.lower === 1 && l.upper === 1)).toBe(true);
    });
  });

  it('when the input is invalid, then it throws AnalysisInputError', () => {
    expect(() => funnelLimits(1.5, [10])).toThrow(AnalysisInputError);
    expect(() => funnelLimits(0.1, [])).toThrow(/sizes/);
    expect(() => funnelLimits(0.1, [0])).toThrow(/sizes\[0\]/);
    expect(() => funnelLimits(0.1, [10], { levels: [1.5] })).toThrow(/levels\[0\]/);
  });
});
