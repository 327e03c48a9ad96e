import type { Span } from './types.js';

/**
 * Stretches of at least `minPoints` points all rising or all falling, where equal neighbours
 * count once (like values neither make nor break a trend: Perla RJ, Provost LP, Murray SK,
 * BMJ Qual Saf 2011;20:46-51). `indices[i]` is the position in the caller's series of `values[i]`.
 * Each maximal stretch is reported once; its start is the last of the equal points it starts from
 * and its end the first of the equal points it ends on, i.e. where the movement starts and stops.
 */
export function monotoneRuns(indices: readonly number[], values: readonly number[], minPoints: number): Span[] {
  const groups: { value: number; first: number; last: number }[] = [];
  values.forEach((value, i) => {
    const g = groups[groups.length - 1];
    if (g && g.value === value) g.last = indices[i];
    else groups.push({ value, first: indices[i], last: indices[i] });
  });
  const out: Span[] = [];
  let s = 0;
  while (s < groups.length - 1) {
    const up = groups[s + 1].value > groups[s].value;
    let e = s + 1;
    while (e < groups.length - 1 && groups[e + 1].value > groups[e].value === up) e += 1;
    if (e - s + 1 >= minPoints) out.push({ start: groups[s].last, end: groups[e].first });
    s = e;
  }
  return out;
}
