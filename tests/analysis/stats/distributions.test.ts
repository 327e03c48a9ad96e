import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import * as dist from '../../../analysis/stats/distributions.js';
import { BETA, expectClose, REFERENCE } from '../helpers.js';

/** Exact binomial P(X <= k) for prob 1/2, with BigInt: sum C(n, j) / 2^n (an independent computation). */
function exactHalfBinomialCdf(k: number, n: number): number {
  let c = 1n;
  let sum = 0n;
  for (let j = 0; j <= k; j += 1) {
    sum += c;
    c = (c * BigInt(n - j)) / BigInt(j + 1);
  }
  // scale down before converting so that large n keeps its precision
  const shift = BigInt(Math.max(0, n - 1000));
  return Number(sum >> shift) / 2 ** (n - Number(shift));
}

describe('distributions (the wrappers analysis/ uses, against @stdlib)', () => {
  it('when the normal quantile and cdf are compared with @stdlib, then they agree to 1e-8', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-10, max: 1 - 1e-10, noNaN: true }), (p) => {
        // jstat's quantile is about 1.5e-9 relative off at p = 1e-10, closer elsewhere
        expectClose(dist.normalQuantile(p), normalQuantile(p, 0, 1), { rel: 1e-8, abs: 1e-9 });
      }),
    );
    fc.assert(
      fc.property(fc.double({ min: -8, max: 8, noNaN: true }), (x) => {
        expectClose(dist.normalCdf(x), normalCdf(x, 0, 1), { rel: 1e-9, abs: 1e-15 });
      }),
    );
  });

  it('when z for 95% is asked, then it is 1.959964 (standard normal tables)', () => {
    expectClose(dist.zForLevel(0.95), 1.959964, { abs: 5e-7 });
  });

  it('when the chi-square quantile is compared with @stdlib, then it agrees to 1e-9', () => {
    // only where the quantile is below 1,900: @stdlib chisquare-quantile 0.2.3 goes wrong above about
    // 2,000 (rate-interval.test.ts checks large counts against the Poisson definition instead)
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }), fc.integer({ min: 1, max: 1800 }), (p, k) => {
        fc.pre(chisquareQuantile(p, k) < 1900);
        expectClose(dist.chiSquareQuantile(p, k), chisquareQuantile(p, k), REFERENCE);
      }),
    );
  });

  it('when the beta quantile is compared with @stdlib, then it agrees to 1e-6 relative', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }),
        fc.double({ min: 0.5, max: 5000, noNaN: true }),
        fc.double({ min: 0.5, max: 5000, noNaN: true }),
        (p, a, b) => {
          expectClose(dist.betaQuantile(p, a, b), betaQuantile(p, a, b), BETA);
        },
      ),
    );
  });

  it('when binomial probabilities are summed, then they match the exact BigInt sum for prob 1/2', () => {
    for (const n of [0, 1, 2, 7, 30, 99, 500, 1200]) {
      // Terms outside the returned window are below 1e-300 of the mode's: 0 to double precision.
      const { lo, probabilities } = dist.binomialPmf(n, 0.5);
      let cdf = 0;
      for (let k = 0; k <= n; k += 1) {
        cdf += k >= lo && k - lo < probabilities.length ? probabilities[k - lo] : 0;
        if (k % 7 === 0 || k === n) expectClose(cdf, exactHalfBinomialCdf(k, n), { rel: 1e-12, abs: 1e-300 });
      }
    }
  });

  it('when the binomial quantile qbinom(0.05, n, 1/2) is asked, then it is the smallest k with exact P(X <= k) >= 0.05', () => {
    for (let n = 0; n <= 300; n += 1) {
      let k = 0;
      while (exactHalfBinomialCdf(k, n) < 0.05) k += 1;
      expect(dist.binomialQuantile(0.05, n, 0.5)).toBe(k);
    }
  });

  it('when hypergeometric probabilities are computed, then they equal C(m, x) C(n, k - x) / C(m + n, k) by BigInt', () => {
    const choose = (n: number, k: number): bigint => {
      let c = 1n;
      for (let j = 0; j < k; j += 1) c = (c * BigInt(n - j)) / BigInt(j + 1);
      return c;
    };
    for (const [m, n, k] of [
      [4, 4, 4],
      [10, 20, 10],
      [56, 29, 5],
      [70, 80, 104],
    ]) {
      const { lo, probabilities } = dist.hypergeometricPmf(m, n, k);
      const all = choose(m + n, k);
      probabilities.forEach((p, i) => {
        const x = lo + i;
        const exact = Number((choose(m, x) * choose(n, k - x) * 10n ** 30n) / all) / 1e30;
        expectClose(p, exact, { rel: 1e-12, abs: 1e-29 });
      });
    }
  });
});
