/**
 * Distribution functions used by the interval and test functions.
 *
 * Continuous quantiles come from jstat (checked against @stdlib to about 1e-11 in the tests);
 * simple-statistics' normal functions are table-level approximations and are not used here.
 * Discrete probabilities (binomial, hypergeometric) are computed here by the ratio of
 * successive terms, started at the mode and normalised by their sum: exact to rounding, with no
 * log-gamma cancellation for large n.
 */
import jStat from 'jstat';

/** Standard normal quantile, the z with Phi(z) = p. */
export function normalQuantile(p: number): number {
  return jStat.normal.inv(p, 0, 1);
}

/** Standard normal distribution function Phi(x). */
export function normalCdf(x: number): number {
  return jStat.normal.cdf(x, 0, 1);
}

/** Two-sided critical value for a confidence level, z_{1 - (1 - level)/2}. */
export function zForLevel(level: number): number {
  return normalQuantile(1 - (1 - level) / 2);
}

/** Beta(a, b) quantile. */
export function betaQuantile(p: number, a: number, b: number): number {
  return jStat.beta.inv(p, a, b);
}

/** Chi-square quantile with `dof` degrees of freedom. */
export function chiSquareQuantile(p: number, dof: number): number {
  return jStat.chisquare.inv(p, dof);
}

/** Relative size below which a binomial term is dropped: far under double precision of the sum (>= 1). */
const NEGLIGIBLE = 1e-300;

/**
 * Probabilities P(X = k) of Binomial(n, prob) over the window [lo, lo + length - 1] outside
 * which every term is below 1e-300 of the mode's (0 to double precision once normalised).
 * Computed by the ratio recurrence outwards from the mode, so a size of 200,000 costs the few
 * thousand terms around its mean rather than 200,001 (the funnel plot asks for many sizes).
 */
export function binomialPmf(n: number, prob: number): { lo: number; probabilities: Float64Array } {
  if (prob <= 0) return { lo: 0, probabilities: Float64Array.of(1) };
  if (prob >= 1) return { lo: n, probabilities: Float64Array.of(1) };
  const mode = Math.min(n, Math.floor((n + 1) * prob));
  const odds = prob / (1 - prob);
  const up = (k: number, v: number) => (v * ((n - k) / (k + 1))) * odds; // P(k + 1) from P(k)
  const down = (k: number, v: number) => (v * (k / (n - k + 1))) / odds; // P(k - 1) from P(k)
  let hi = mode;
  for (let v = 1; hi < n; hi += 1) { v = up(hi, v); if (v < NEGLIGIBLE) break; }
  let lo = mode;
  for (let v = 1; lo > 0; lo -= 1) { v = down(lo, v); if (v < NEGLIGIBLE) break; }
  const out = new Float64Array(hi - lo + 1);
  out[mode - lo] = 1;
  for (let k = mode; k < hi; k += 1) out[k + 1 - lo] = up(k, out[k - lo]);
  for (let k = mode; k > lo; k -= 1) out[k - 1 - lo] = down(k, out[k - lo]);
  let sum = 0;
  for (let i = 0; i < out.length; i += 1) sum += out[i];
  for (let i = 0; i < out.length; i += 1) out[i] /= sum;
  return { lo, probabilities: out };
}

/**
 * Binomial quantile as R's qbinom: the smallest x with P(X <= x) >= p, with R's fuzz
 * (p * (1 - 64 * machine epsilon)) so that rounding in the sum does not push x one up.
 */
export function binomialQuantile(p: number, n: number, prob: number): number {
  const { lo, probabilities } = binomialPmf(n, prob);
  const target = p * (1 - 64 * Number.EPSILON);
  let cdf = 0;
  for (let i = 0; i < probabilities.length; i += 1) {
    cdf += probabilities[i];
    if (cdf >= target) return lo + i;
  }
  return n;
}

/**
 * Hypergeometric probabilities of x, the count in the first row of a 2x2 table with fixed
 * margins: first row total `rowTotal`, second row total `otherRowTotal`, first column total
 * `colTotal`. Returns the lowest x of the support and the probabilities over the support.
 */
export function hypergeometricPmf(
  rowTotal: number,
  otherRowTotal: number,
  colTotal: number,
): { lo: number; probabilities: Float64Array } {
  const lo = Math.max(0, colTotal - otherRowTotal);
  const hi = Math.min(colTotal, rowTotal);
  const size = hi - lo + 1;
  const d = new Float64Array(size);
  const all = rowTotal + otherRowTotal;
  const mode = Math.min(hi, Math.max(lo, Math.floor(((colTotal + 1) * (rowTotal + 1)) / (all + 2))));
  // ratio P(x + 1) / P(x) = (m - x)(k - x) / ((x + 1)(n - k + x + 1))
  const ratio = (x: number): number =>
    ((rowTotal - x) * (colTotal - x)) / ((x + 1) * (otherRowTotal - colTotal + x + 1));
  d[mode - lo] = 1;
  for (let x = mode; x < hi; x += 1) d[x + 1 - lo] = d[x - lo] * ratio(x);
  for (let x = mode; x > lo; x -= 1) d[x - 1 - lo] = d[x - lo] / ratio(x - 1);
  let sum = 0;
  for (let i = 0; i < size; i += 1) sum += d[i];
  for (let i = 0; i < size; i += 1) d[i] /= sum;
  return { lo, probabilities: d };
}
