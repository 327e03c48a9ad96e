import { monotoneRuns } from './monotone-runs.js';

/**
 * The special-cause rules applied to Shewhart charts (p, u, individuals, g), with stable ids
 * (Provost LP, Murray SK, The Health Care Data Guide, 2011, ch. 5; Western Electric, Statistical
 * Quality Control Handbook, 1956).
 */
export const SPECIAL_CAUSE_RULES = [
  { id: 'outside-3-sigma', description: 'One point outside the 3-sigma control limits' },
  { id: 'eight-one-side', description: 'Eight or more points in a row on the same side of the centre line' },
  { id: 'six-trend', description: 'Six or more points in a row all rising or all falling (equal neighbours count once)' },
  { id: 'two-of-three-beyond-2-sigma', description: 'Two out of three points in a row beyond 2 sigma on the same side' },
  { id: 'fifteen-within-1-sigma', description: 'Fifteen or more points in a row within 1 sigma of the centre line (inner third)' },
] as const;

export type SpecialCauseRuleId = (typeof SPECIAL_CAUSE_RULES)[number]['id'];

/** A rule that fired, with the indices of the first and last point involved (inclusive). */
export type Signal = { rule: SpecialCauseRuleId; start: number; end: number };

/** What the rules need of each point: its value, the centre, its sigma (null if undefined) and whether it is outside. */
export type RulePoint = { value: number; centre: number; sigma: number | null; outside: boolean };

/**
 * Applies the five rules to a chart's points, in order of index then rule.
 * - outside-3-sigma: each point strictly beyond a (clamped) limit, one signal per point.
 * - eight-one-side: maximal runs of >= 8 points above, or below, the centre; points exactly on the
 *   centre neither break nor extend a run (as for run charts).
 * - six-trend: >= 6 points all rising or all falling, equal neighbours counted once.
 * - two-of-three-beyond-2-sigma: any 3 consecutive points of which >= 2 lie strictly beyond
 *   2 sigma on the same side; overlapping findings on the same side are merged into one span
 *   from the first to the last point beyond 2 sigma.
 * - fifteen-within-1-sigma: maximal runs of >= 15 points strictly within 1 sigma of the centre;
 *   a point with sigma 0 or undefined is not within.
 */
export function specialCauseSignals(points: readonly RulePoint[]): Signal[] {
  const signals: Signal[] = [];
  points.forEach((p, i) => {
    if (p.outside) signals.push({ rule: 'outside-3-sigma', start: i, end: i });
  });

  for (const side of [1, -1]) {
    let run: { start: number; end: number; length: number } | null = null;
    const close = () => {
      if (run && run.length >= 8) signals.push({ rule: 'eight-one-side', start: run.start, end: run.end });
      run = null;
    };
    points.forEach((p, i) => {
      if (p.value === p.centre) return;
      if ((p.value > p.centre ? 1 : -1) === side) {
        if (run) {
          run.end = i;
          run.length += 1;
        } else run = { start: i, end: i, length: 1 };
      } else close();
    });
    close();
  }

  const all = points.map((_, i) => i);
  for (const t of monotoneRuns(all, points.map((p) => p.value), 6)) signals.push({ rule: 'six-trend', ...t });

  for (const side of [1, -1]) {
    const beyond = points.map((p) => p.sigma !== null && side * (p.value - p.centre) > 2 * p.sigma);
    let open: { start: number; end: number } | null = null;
    for (let i = 0; i + 2 < points.length; i += 1) {
      const hits = [i, i + 1, i + 2].filter((j) => beyond[j]);
      if (hits.length < 2) continue;
      const span = { start: hits[0], end: hits[hits.length - 1] };
      if (open && span.start <= open.end) open.end = Math.max(open.end, span.end);
      else {
        if (open) signals.push({ rule: 'two-of-three-beyond-2-sigma', ...open });
        open = span;
      }
    }
    if (open) signals.push({ rule: 'two-of-three-beyond-2-sigma', ...open });
  }

  let inner: { start: number; length: number } | null = null;
  const closeInner = (end: number) => {
    if (inner && inner.length >= 15) signals.push({ rule: 'fifteen-within-1-sigma', start: inner.start, end });
    inner = null;
  };
  points.forEach((p, i) => {
    if (p.sigma !== null && p.sigma > 0 && Math.abs(p.value - p.centre) < p.sigma) {
      if (inner) inner.length += 1;
      else inner = { start: i, length: 1 };
    } else closeInner(i - 1);
  });
  closeInner(points.length - 1);

  const order = SPECIAL_CAUSE_RULES.map((r) => r.id as string);
  return signals.sort((x, y) => x.start - y.start || order.indexOf(x.rule) - order.indexOf(y.rule) || x.end - y.end);
}
