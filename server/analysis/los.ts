/**
 * Length-of-stay summaries from a frequency table (SQL GROUP BY length of stay), so that no
 * case rows reach Node.
 */

/**
 * Quantile of the sample a frequency table describes, by R's default (type 7) definition:
 * h = (N - 1) p; the value at the 0-based order statistics floor(h) and floor(h) + 1,
 * linearly interpolated (Hyndman RJ, Fan Y, Am Stat 1996;50:361-5, definition 7).
 * @param table { value, count } rows, any order; counts whole numbers >= 0
 * @param p probability in [0, 1]
 * @returns null for an empty table
 * @example quantileFromCounts([{ value: 1, count: 1 }, { value: 2, count: 1 }, { value: 10, count: 2 }], 0.5) // 6
 */
export function quantileFromCounts(table: readonly { value: number; count: number }[], p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new Error(`quantileFromCounts: p must be from 0 to 1 (got ${p})`);
  const rows = table.filter((r) => r.count > 0).slice().sort((a, b) => a.value - b.value);
  const n = rows.reduce((s, r) => s + r.count, 0);
  if (n === 0) return null;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const at = (k: number): number => {
    let seen = 0;
    for (const r of rows) {
      seen += r.count;
      if (k < seen) return r.value;
    }
    return rows[rows.length - 1].value;
  };
  const a = at(lo);
  const b = at(Math.min(lo + 1, n - 1));
  return a + (h - lo) * (b - a);
}

/** Histogram bins of whole days 0..capAt-1 and one pooled bin "capAt+" (long stays are rare). */
export function losHistogram(table: readonly { value: number; count: number }[], capAt = 30): { days: string; count: number }[] {
  const max = table.reduce((m, r) => Math.max(m, r.value), 0);
  const top = Math.min(max, capAt);
  const bins = Array.from({ length: top + 1 }, (_, d) => ({ days: d === capAt ? `${capAt}+` : String(d), count: 0 }));
  for (const r of table) bins[Math.min(r.value, capAt)].count += r.count;
  return bins;
}
