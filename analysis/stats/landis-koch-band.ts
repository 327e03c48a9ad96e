import { AnalysisInputError } from '../errors.js';
import * as check from './validate.js';

/** Landis & Koch strength-of-agreement bands, lowest first. */
export const LANDIS_KOCH_BANDS = ['poor', 'slight', 'fair', 'moderate', 'substantial', 'almost perfect'] as const;
export type LandisKochBand = (typeof LANDIS_KOCH_BANDS)[number];

/**
 * The Landis & Koch label for a kappa value.
 *
 * Definition (half-open bands): below 0 poor; [0, 0.2] slight; (0.2, 0.4] fair; (0.4, 0.6] moderate;
 * (0.6, 0.8] substantial; (0.8, 1] almost perfect (Landis JR, Koch GG, Biometrics 1977;33:159-74).
 * The bands are a convention for describing agreement, not a test.
 *
 * @param kappa a kappa value, finite, from -1 to 1
 * @throws AnalysisInputError for a value that is not a finite number in [-1, 1]
 * @example landisKochBand(0.2105) // 'fair'
 */
export function landisKochBand(kappa: number): LandisKochBand {
  const fn = 'landisKochBand';
  const k = check.finiteNumber(fn, 'kappa', kappa);
  if (k < -1 || k > 1) throw new AnalysisInputError(fn, 'kappa', `must be between -1 and 1 (got ${k})`);
  if (k < 0) return 'poor';
  if (k <= 0.2) return 'slight';
  if (k <= 0.4) return 'fair';
  if (k <= 0.6) return 'moderate';
  if (k <= 0.8) return 'substantial';
  return 'almost perfect';
}
