/**
 * The re-abstraction agreement figures (server/quality/agreement.ts) against a published worked
 * example and independent arithmetic, and the seeded sampler (server/quality/prng.ts).
 */
import { describe, expect, it } from 'vitest';
import { fieldAgreement, valueText } from '../../../server/quality/agreement.js';
import { mulberry32, sampleWithoutReplacement } from '../../../server/quality/prng.js';

const rep = <T>(n: number, x: T): T[] => Array.from({ length: n }, () => x);

describe('kappa for a coded field', () => {
  // Worked example from a secondary teaching source, as recorded in docs TRADE.md ("A worked
  // example seen in a secondary teaching source (not in Cohen's paper)"): 20 paired ratings,
  // 12 yes-yes, 2 B-yes-A-no, 4 A-yes-B-no, 2 no-no: po 0.70, pe 0.62, kappa 0.2105.
  // Formula: Cohen J, Educ Psychol Meas 1960;20:37-46. A = first abstraction, B = re-abstraction.
  const pairs = [
    ...rep(12, { original: true, reabstracted: true }),
    ...rep(2, { original: false, reabstracted: true }),
    ...rep(4, { original: true, reabstracted: false }),
    ...rep(2, { original: false, reabstracted: false }),
  ];

  it('when the worked example is entered as a yes/no field, then po 0.70, pe 0.62 and kappa 0.2105 (fair)', () => {
    const a = fieldAgreement('copd', pairs);
    expect(a.pairs).toBe(20);
    expect(a.agree).toBe(14);
    expect(a.percentAgreement).toBeCloseTo(0.7, 12); // worked example: po 0.70
    expect(a.observedAgreement).toBeCloseTo(0.7, 12);
    expect(a.expectedAgreement).toBeCloseTo(0.62, 12); // worked example: pe 0.62
    expect(a.kappa).toBeCloseTo(0.2105, 4); // worked example: kappa 0.2105
    // Landis JR, Koch GG, Biometrics 1977;33:159-74: (0.2, 0.4] is "fair".
    expect(a.band).toBe('fair');
    expect(a.limits).toBeNull();
  });

  it('when computed independently from the 2x2 table margins, then the same kappa', () => {
    // Independent arithmetic: A said yes 16 times, B 14 times, of 20.
    const n = 20;
    const po = (12 + 2) / n;
    const pe = (16 / n) * (14 / n) + (4 / n) * (6 / n);
    const kappa = (po - pe) / (1 - pe);
    const a = fieldAgreement('copd', pairs);
    expect(a.kappa).toBeCloseTo(kappa, 12);
    expect(a.expectedAgreement).toBeCloseTo(pe, 12);
  });

  it('when agreement equals chance, then kappa 0 reads "slight", and below chance "poor" (Landis & Koch half-open bands)', () => {
    const chance = fieldAgreement('sex', [
      { original: 'male', reabstracted: 'male' }, { original: 'male', reabstracted: 'female' },
      { original: 'female', reabstracted: 'male' }, { original: 'female', reabstracted: 'female' },
    ]);
    expect(chance.kappa).toBe(0); // po 0.5 = pe 0.5 (independent arithmetic)
    expect(chance.band).toBe('slight'); // Landis & Koch 1977: [0, 0.2] slight
    const worse = fieldAgreement('sex', [{ original: 'male', reabstracted: 'female' }, { original: 'female', reabstracted: 'male' }]);
    expect(worse.kappa).toBe(-1); // po 0, pe 0.5: (0 - 0.5) / 0.5 (independent arithmetic)
    expect(worse.band).toBe('poor');
  });

  it('when one abstraction left a value empty, then "not documented" is a category of its own and the pair disagrees', () => {
    const a = fieldAgreement('smokingStatus', [
      { original: 'never', reabstracted: 'never' }, { original: 'current', reabstracted: null }, { original: 'former', reabstracted: 'former' },
    ]);
    expect(a.agree).toBe(2);
    expect(a.pairsWithMissing).toBe(1);
    // Categories never/current/former/not documented; A: 1,1,1,0; B: 1,0,1,1 -> pe = 2/9, po = 2/3 (independent arithmetic).
    expect(a.kappa).toBeCloseTo((2 / 3 - 2 / 9) / (1 - 2 / 9), 12);
    expect(valueText('smokingStatus', null)).toBe('not documented');
  });

  it('when both abstractions used one value throughout, then kappa is undefined and says why', () => {
    const a = fieldAgreement('copd', rep(5, { original: false, reabstracted: false }));
    expect(a.kappa).toBeNull();
    expect(a.percentAgreement).toBe(1);
    expect(a.note).toMatch(/undefined/);
  });
});

describe('limits of agreement for numbers and dates', () => {
  it('when heights are re-abstracted, then mean difference and limits are mean(d) ± 1.96 SD(d) (Bland & Altman, Lancet 1986)', () => {
    const first = [170, 182, 165, 158, 190];
    const second = [172, 182, 163, 158, 189];
    const a = fieldAgreement('heightCm', first.map((o, i) => ({ original: o, reabstracted: second[i] })));
    // Independent arithmetic: d = first - second = [-2, 0, 2, 0, 1].
    const d = first.map((x, i) => x - second[i]);
    const mean = d.reduce((s, x) => s + x, 0) / d.length;
    const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (d.length - 1));
    expect(a.limits!.n).toBe(5);
    expect(a.limits!.meanDifference).toBeCloseTo(0.2, 12);
    expect(a.limits!.sdDifference).toBeCloseTo(sd, 12);
    expect(a.limits!.lower).toBeCloseTo(mean - 1.96 * sd, 12);
    expect(a.limits!.upper).toBeCloseTo(mean + 1.96 * sd, 12);
    expect(a.percentAgreement).toBeCloseTo(2 / 5, 12);
    expect(a.kappa).toBeNull();
  });

  it('when a number is missing on one side, then the pair is left out of the limits and counted', () => {
    const a = fieldAgreement('age', [{ original: 60, reabstracted: 61 }, { original: 70, reabstracted: null }, { original: 50, reabstracted: 50 }]);
    expect(a.limits!.n).toBe(2);
    expect(a.pairsWithMissing).toBe(1);
    expect(a.limits!.meanDifference).toBeCloseTo(-0.5, 12);
  });

  it('when dates differ, then the differences are in days', () => {
    const a = fieldAgreement('dischargeDate', [
      { original: '2025-03-01', reabstracted: '2025-03-03' }, { original: '2025-02-28', reabstracted: '2025-03-01' }, { original: '2024-12-31', reabstracted: '2024-12-31' },
    ]);
    // first minus second: -2, -1 (2025 is not a leap year), 0 days.
    expect(a.limits!.meanDifference).toBeCloseTo(-1, 12);
    expect(a.unit).toBe('days');
  });
});

describe('seeded sampling', () => {
  it('when the same seed is used, then the same sample; another seed, another sample', () => {
    const pool = Array.from({ length: 100 }, (_, i) => `case-${i}`);
    expect(sampleWithoutReplacement(pool, 10, 42)).toEqual(sampleWithoutReplacement(pool, 10, 42));
    expect(sampleWithoutReplacement(pool, 10, 42)).not.toEqual(sampleWithoutReplacement(pool, 10, 43));
    const s = sampleWithoutReplacement(pool, 10, 42);
    expect(new Set(s).size).toBe(10);
    expect(sampleWithoutReplacement(pool, 500, 1)).toHaveLength(100);
    expect(pool[0]).toBe('case-0'); // the pool is not changed
  });

  it('when many seeds draw 2 of 4, then each of the 6 pairs comes up about equally often (chi-square below the 0.1% point)', () => {
    const counts = new Map<string, number>();
    const draws = 6000;
    for (let seed = 0; seed < draws; seed++) {
      const k = sampleWithoutReplacement(['a', 'b', 'c', 'd'], 2, seed).sort().join('');
      counts.set(k, (counts.get(k) ?? 0) + 1);
    }
    expect(counts.size).toBe(6);
    const e = draws / 6;
    const chi2 = [...counts.values()].reduce((s, o) => s + (o - e) ** 2 / e, 0);
    // Chi-square 0.999 quantile with 5 degrees of freedom: 20.515 (standard tables).
    expect(chi2).toBeLessThan(20.515);
  });

  it('when mulberry32 runs, then it gives numbers in [0, 1)', () => {
    const r = mulberry32(123);
    for (let i = 0; i < 1000; i++) {
      const x = r();
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
    }
  });
});
