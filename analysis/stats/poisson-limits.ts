import { chiSquareQuantile } from './distributions.js';

/**
 * Exact (Garwood) confidence limits for the mean of a Poisson count x:
 * lower = chi2^-1(alpha/2; 2x) / 2 (0 when x = 0), upper = chi2^-1(1 - alpha/2; 2x + 2) / 2
 * (Garwood F, Biometrika 1936;28:437-42; Ulm K, Am J Epidemiol 1990;131:373-5).
 * Internal: callers validate x (whole number >= 0) and level.
 * @example poissonLimits(10, 0.95) // { lower: 4.7954, upper: 18.3904 }
 */
export function poissonLimits(x: number, level: number): { lower: number; upper: number } {
  const alpha = 1 - level;
  const lower = x === 0 ? 0 : chiSquareQuantile(alpha / 2, 2 * x) / 2;
  const upper = chiSquareQuantile(1 - alpha / 2, 2 * x + 2) / 2;
  return { lower: Math.min(lower, x), upper: Math.max(upper, x) };
}
