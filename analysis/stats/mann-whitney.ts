import { normalCdf } from './distributions.js';

export type MedianComparison = {
  /** Median of sample A (mean of the two middle values when the size is even). */
  medianA: number;
  /** Median of sample B. */
  medianB: number;
  /** Mann-Whitney U of sample A: the number of pairs (a, b) with a > b, ties counting 1/2. */
  u: number;
  /** Two-sided p, normal approximation with tie and continuity corrections. */
  p: number;
};

/**
 * Shared core of compareMedians and compareMediansFromCounts, on validated, merged frequency
 * tables: `values` sorted ascending and distinct, `countA[i]`, `countB[i]` the cases of each sample
 * with that value (each sample has at least one case).
 *
 * U_A = R_A - nA(nA + 1)/2 with mid-ranks; z = (U_A - nA nB/2 - sign * 1/2) / sigma with
 * sigma^2 = nA nB / 12 * ((N + 1) - sum(t^3 - t) / (N (N - 1))); p = 2 min(Phi(z), 1 - Phi(z))
 * (Mann HB, Whitney DR, Ann Math Stat 1947;18:50-60; Hollander M, Wolfe DA, Nonparametric
 * Statistical Methods, 2nd ed. 1999, sec. 4.1; as R's wilcox.test(exact = FALSE, correct = TRUE)).
 * When every value is tied the permutation distribution of U is a single point, so p = 1.
 */
export function mannWhitneyFromTable(
  values: readonly number[],
  countA: readonly number[],
  countB: readonly number[],
): MedianComparison {
  let nA = 0;
  let nB = 0;
  for (let i = 0; i < values.length; i += 1) {
    nA += countA[i];
    nB += countB[i];
  }
  const total = nA + nB;
  let rankSumA = 0;
  let tieSum = 0;
  let below = 0;
  for (let i = 0; i < values.length; i += 1) {
    const t = countA[i] + countB[i];
    if (t === 0) continue;
    rankSumA += countA[i] * (below + (t + 1) / 2);
    tieSum += t * t * t - t;
    below += t;
  }
  const u = rankSumA - (nA * (nA + 1)) / 2;
  const distinct = values.filter((_, i) => countA[i] + countB[i] > 0).length;
  let p = 1;
  if (distinct > 1) {
    const variance = ((nA * nB) / 12) * (total + 1 - tieSum / (total * (total - 1)));
    const centred = u - (nA * nB) / 2;
    const z = (centred - Math.sign(centred) * 0.5) / Math.sqrt(variance);
    p = Math.min(1, 2 * normalCdf(-Math.abs(z)));
  }
  return { medianA: tableMedian(values, countA, nA), medianB: tableMedian(values, countB, nB), u, p };
}

/** Median of a sorted frequency table with n >= 1 cases. */
function tableMedian(values: readonly number[], counts: readonly number[], n: number): number {
  const at = (k: number): number => {
    // value of the k-th smallest case, k = 1..n
    let seen = 0;
    for (let i = 0; i < values.length; i += 1) {
      seen += counts[i];
      if (seen >= k) return values[i];
    }
    return values[values.length - 1];
  };
  return n % 2 === 1 ? at((n + 1) / 2) : (at(n / 2) + at(n / 2 + 1)) / 2;
}

/** Merges two frequency maps into the sorted table mannWhitneyFromTable takes. */
export function mergeTables(
  a: ReadonlyMap<number, number>,
  b: ReadonlyMap<number, number>,
): { values: number[]; countA: number[]; countB: number[] } {
  const values = [...new Set([...a.keys(), ...b.keys()])].sort((x, y) => x - y);
  return { values, countA: values.map((v) => a.get(v) ?? 0), countB: values.map((v) => b.get(v) ?? 0) };
}
