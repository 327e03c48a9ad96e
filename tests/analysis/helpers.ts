/**
 * Shared tolerances for the analysis tests.
 *
 * - PUBLISHED(dp): a value printed to `dp` decimals matches when within half a unit of its last digit.
 * - REFERENCE: agreement with an independent numeric library (@stdlib) or an exact computation
 *   written in the test: 1e-9 relative (jstat's normal and chi-square quantiles agree with @stdlib to
 *   about 1e-11).
 * - BETA: jstat's incomplete beta stops its continued fraction at a relative change of 3e-7
 *   (Numerical Recipes), so its beta quantiles agree with @stdlib to about 1e-7 relative (7e-8 worst
 *   over 78,000 interval limits tried): checked to 1e-6 relative, the accuracy the module promises.
 */
import { expect } from 'vitest';

export type Tolerance = { abs?: number; rel?: number };

export const REFERENCE: Tolerance = { rel: 1e-9, abs: 1e-12 };

export const BETA: Tolerance = { rel: 1e-6, abs: 1e-12 };

/** Tolerance for a value published to `dp` decimal places. */
export function PUBLISHED(dp: number): Tolerance {
  return { abs: 0.5 * 10 ** -dp + 1e-12 };
}

/** True when |actual - expected| <= max(abs, rel * |expected|). */
export function isClose(actual: number, expected: number, tol: Tolerance = REFERENCE): boolean {
  if (actual === expected) return true;
  const bound = Math.max(tol.abs ?? 0, (tol.rel ?? 0) * Math.abs(expected));
  return Math.abs(actual - expected) <= bound;
}

/** Asserts closeness with a message that shows both numbers and the bound. */
export function expectClose(actual: number | null, expected: number, tol: Tolerance = REFERENCE, what = 'value'): void {
  expect(actual, `${what} is null`).not.toBeNull();
  const a = actual as number;
  const bound = Math.max(tol.abs ?? 0, (tol.rel ?? 0) * Math.abs(expected));
  expect(
    isClose(a, expected, tol),
    `${what}: got ${a}, expected ${expected} (difference ${Math.abs(a - expected)}, allowed ${bound})`,
  ).toBe(true);
}

/** Asserts an interval's limits (and optionally estimate) against reference values. */
export function expectInterval(
  actual: { estimate: number | null; lower: number | null; upper: number | null },
  expected: { estimate?: number; lower: number; upper: number },
  tol: Tolerance = REFERENCE,
): void {
  if (expected.estimate !== undefined) expectClose(actual.estimate, expected.estimate, tol, 'estimate');
  expectClose(actual.lower, expected.lower, tol, 'lower');
  expectClose(actual.upper, expected.upper, tol, 'upper');
}

/** ln(m!) by direct sum below 30, else by Stirling's series for ln Gamma(m + 1) (Abramowitz & Stegun 6.1.41). */
function logFactorial(m: number): number {
  if (m < 30) {
    let s = 0;
    for (let k = 2; k <= m; k += 1) s += Math.log(k);
    return s;
  }
  const x = m + 1;
  const x2 = x * x;
  return (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + (1 / x) * (1 / 12 - (1 / x2) * (1 / 360 - (1 / x2) * (1 / 1260 - 1 / (1680 * x2))));
}

/** Poisson term P(X = k; mean) from its definition e^-mean mean^k / k!. */
function poissonTerm(k: number, mean: number): number {
  return Math.exp(-mean + k * Math.log(mean) - logFactorial(k));
}

/**
 * Poisson tail probabilities from the definition, summed outward from the term at x by the ratio of
 * successive terms (an independent computation, used to check exact Poisson limits for large counts):
 * `lower` = P(X <= x), `upper` = P(X >= x).
 */
export function poissonTails(x: number, mean: number): { lower: number; upper: number } {
  const t = poissonTerm(x, mean);
  let below = 0; // sum over k < x
  for (let k = x, term = t; k > 0; k -= 1) {
    term *= k / mean;
    below += term;
    if (term < below * 1e-18) break;
  }
  let above = 0; // sum over k > x
  for (let k = x, term = t; ; k += 1) {
    term *= mean / (k + 1);
    above += term;
    if (term < above * 1e-18 || term === 0) break;
  }
  const total = below + t + above; // 1 up to rounding; normalising removes the error of the term at x
  return { lower: (below + t) / total, upper: (t + above) / total };
}
