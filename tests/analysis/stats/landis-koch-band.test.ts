import { describe, expect, it } from 'vitest';
import { AnalysisInputError, landisKochBand, LANDIS_KOCH_BANDS } from '../../../analysis/index.js';

// Landis JR, Koch GG, Biometrics 1977;33:159-74, bands read as half-open intervals:
// < 0 poor, [0, 0.2] slight, (0.2, 0.4] fair, (0.4, 0.6] moderate, (0.6, 0.8] substantial, (0.8, 1] almost perfect.
describe('landisKochBand', () => {
  it.each([
    [-1, 'poor'],
    [-0.0001, 'poor'],
    [0, 'slight'],
    [0.2, 'slight'],
    [0.2001, 'fair'],
    [0.4, 'fair'],
    [0.41, 'moderate'],
    [0.6, 'moderate'],
    [0.61, 'substantial'],
    [0.8, 'substantial'],
    [0.81, 'almost perfect'],
    [1, 'almost perfect'],
  ])('when kappa is %f, then the band is %s', (k, band) => {
    expect(landisKochBand(k)).toBe(band);
  });

  it('when the bands are listed, then they run from poor to almost perfect', () => {
    expect(LANDIS_KOCH_BANDS).toEqual(['poor', 'slight', 'fair', 'moderate', 'substantial', 'almost perfect']);
  });

  it('when kappa is outside [-1, 1] or not a number, then it throws AnalysisInputError', () => {
    expect(() => landisKochBand(1.2)).toThrow(AnalysisInputError);
    expect(() => landisKochBand(Number.NaN)).toThrow(/kappa/);
  });
});
