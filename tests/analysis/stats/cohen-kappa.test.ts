import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, cohenKappa } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

const repeat = (n: number, pair: [string, string]) => Array.from({ length: n }, () => pair);

/** Kappa from the k x k agreement table in proportions (the textbook layout), computed independently. */
function kappaFromTable(pairs: [string, string][]): { po: number; pe: number; kappa: number | null } {
  const labels = [...new Set(pairs.flat())].sort();
  const idx = new Map(labels.map((l, i) => [l, i]));
  const k = labels.length;
  const t = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (const [a, b] of pairs) t[idx.get(a)!][idx.get(b)!] += 1 / pairs.length;
  const rows = t.map((r) => r.reduce((s, v) => s + v, 0));
  const cols = labels.map((_, j) => t.reduce((s, r) => s + r[j], 0));
  const po = labels.reduce((s, _, i) => s + t[i][i], 0);
  const pe = labels.reduce((s, _, i) => s + rows[i] * cols[i], 0);
  return { po, pe, kappa: Math.abs(1 - pe) < 1e-12 ? null : (po - pe) / (1 - pe) };
}

describe('cohenKappa', () => {
  describe('when checked against a worked teaching example (secondary source for Cohen J, Educ Psychol Meas 1960;20:37-46)', () => {
    // 20 paired ratings: 12 yes-yes, 2 with B yes and A no, 4 with A yes and B no, 2 no-no
    const pairs: [string, string][] = [...repeat(12, ['yes', 'yes']), ...repeat(2, ['no', 'yes']), ...repeat(4, ['yes', 'no']), ...repeat(2, ['no', 'no'])];
    it('then po = 0.70, pe = 0.62 and kappa = 0.2105', () => {
      const r = cohenKappa(pairs);
      expectClose(r.observedAgreement, 0.7, PUBLISHED(2));
      expectClose(r.expectedAgreement, 0.62, PUBLISHED(2));
      expectClose(r.kappa, 0.2105, PUBLISHED(4));
    });
  });

  describe('when compared with the agreement-table computation', () => {
    it('then kappa, po and pe agree on random ratings with up to 4 categories', () => {
      fc.assert(
        fc.property(
          fc.array(fc.tuple(fc.constantFrom('a', 'b', 'c', 'd'), fc.constantFrom('a', 'b', 'c', 'd')), { minLength: 1, maxLength: 80 }),
          (pairs) => {
            const r = cohenKappa(pairs);
            const ref = kappaFromTable(pairs);
            expectClose(r.observedAgreement, ref.po, { abs: 1e-12 });
            expectClose(r.expectedAgreement, ref.pe, { abs: 1e-12 });
            if (ref.kappa === null) expect(r.kappa).toBeNull();
            else expectClose(r.kappa, ref.kappa, { abs: 1e-9 });
          },
        ),
      );
    });
  });

  describe('when the ratings are degenerate', () => {
    it('then both raters using one same category throughout gives pe = 1 and kappa null', () => {
      expect(cohenKappa(repeat(5, ['no', 'no']))).toEqual({ kappa: null, observedAgreement: 1, expectedAgreement: 1 });
    });

    it('then perfect agreement over two categories gives kappa 1, and labels only one rater used count as categories', () => {
      expect(cohenKappa([...repeat(3, ['x', 'x']), ...repeat(2, ['y', 'y'])]).kappa).toBe(1);
      const r = cohenKappa([['x', 'y'], ['x', 'y']]);
      expect(r.observedAgreement).toBe(0);
      expect(r.expectedAgreement).toBe(0);
      expect(r.kappa).toBe(0);
    });
  });

  it('when the input is invalid, then an empty list or a malformed pair throws AnalysisInputError', () => {
    expect(() => cohenKappa([])).toThrow(AnalysisInputError);
    expect(() => cohenKappa([['a', 1 as unknown as string]])).toThrow(/pairs\[0\]/);
  });
});
