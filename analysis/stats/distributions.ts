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

/**
 * Probabilities P(X = k), k = 0..n, of Binomial(n, prob), as an array of n + 1 values.
 * Terms far in the tails may underflow to 0, which is their value to double precision.
 */
export function binomialPmf(n: number, prob: number): Float64Array {
  const out = new Float64Array(n + 1);
  if (prob <= 0) {
    out[0] = 1;
    return out;
  }
  if (prob >= 1) {
    out[n] = 1;
    return out;
  }
  const mode = Math.min(n, Math.floor((n + 1) * prob));
  const odds = prob / (1 - prob);
  out[mode] = 1;
  for (let k = mode; k < n; k += 1) out[k + 1] = (out[k] * ((n - k) / (k + 1))) * odds;
  for (let k = mode; k > 0; k -= 1) out[k - 1] = (out[k] * (k / (n - k + 1))) / odds;
  let sum = 0;
  for (let k = 0; k <= n; k += 1) sum += out[k];
  for (let k = 0; k <= n; k += 1) out[k] /= sum;
  return out;
}

/**
 * Binomial quantile as R's qbinom: the smallest x with P(X <= x) >= p, with R's fuzz
 * (p * (1 - 64 * machine epsilon)) so that rounding in the sum does not push x one up.
 */
export function binomialQuantile(p: number, n: number, prob: number): number {
  const pmf = binomialPmf(n, prob);
  const target = p * (1 - 64 * Number.EPSILON);
  let cdf = 0;
  for (let k = 0; k <= n; k += 1) {
    cdf += pmf[k];
    if (cdf >= target) return k;
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
