/**
 * Builds a measure's chart from its monthly (or quarterly) inputs: values, phases split at the
 * re-basing months, each phase's run-chart analysis (analysis/runChart) and matching control
 * chart (pChart for proportions, uChart for rates, iChart for individuals), and every signal
 * with its words. Pure: the service reads the database and calls this.
 */
import { iChart, pChart, runChart, uChart, SPECIAL_CAUSE_RULES, type ControlChart } from '../../analysis/index.js';
import type { Annotation, ChartPhase, ChartPoint, ChartResponse, ChartSignal } from '../../shared/committee/chart.js';
import { chartKindLabel, DEFAULT_BASELINE_MONTHS, type MeasureDefinition } from '../../shared/committee/measures.js';
import { monthLabel } from './months.js';

export interface PeriodInput {
  period: string;
  numerator: number;
  denominator: number;
  /** Individuals charts: the month's statistic (median, or mean in the measure's unit); else ignored. */
  statistic?: number | null;
  provisional: boolean;
}

export interface BuildOptions {
  /** Periods (same form as `period`) that start a new phase. */
  rebaseAt: readonly string[];
  /** Last period of the first phase's baseline; null = the first DEFAULT_BASELINE points. */
  baselineEnd: string | null;
  defaultBaseline?: number;
  /** Below this denominator a point is flagged as a small count (in words). */
  smallCount?: number;
}

/** Median of a frequency table [[value, count], ...] (the middle value, or the mean of the two middle ones). */
export function medianOfFrequencies(freq: readonly (readonly [number, number])[]): number | null {
  const sorted = [...freq].filter(([, n]) => n > 0).sort((a, b) => a[0] - b[0]);
  const n = sorted.reduce((s, [, c]) => s + c, 0);
  if (n === 0) return null;
  const at = (k: number) => {
    let seen = 0;
    for (const [v, c] of sorted) {
      seen += c;
      if (seen >= k) return v;
    }
    return sorted[sorted.length - 1][0];
  };
  return n % 2 === 1 ? at((n + 1) / 2) : (at(n / 2) + at(n / 2 + 1)) / 2;
}

/** The plotted value of a period in the measure's unit, or null when there is nothing to plot. */
export function periodValue(m: MeasureDefinition, p: PeriodInput): number | null {
  if (m.kind === 'individuals') return p.statistic ?? null;
  if (p.denominator <= 0) return null;
  return m.kind === 'rate' ? (p.numerator / p.denominator) * (m.per ?? 1000) : (p.numerator / p.denominator) * 100;
}

const fmt = (m: MeasureDefinition, v: number | null) =>
  v === null ? '—' : m.unit === 'days' ? `${round(v, 1)} days` : m.unit === '%' ? `${round(v, 1)}%` : `${round(v, 2)} ${m.unit}`;
const round = (v: number, d: number) => Number(v.toFixed(d));

const RULE_LABELS: Record<string, string> = {
  shift: 'Shift',
  trend: 'Trend',
  'longest-run': 'Unusually long run',
  'few-crossings': 'Too few crossings',
  ...Object.fromEntries(SPECIAL_CAUSE_RULES.map((r) => [r.id, r.description])),
};
RULE_LABELS['outside-3-sigma'] = 'Point outside the control limits';
RULE_LABELS['eight-one-side'] = 'Eight in a row on one side';
RULE_LABELS['six-trend'] = 'Six rising or falling';
RULE_LABELS['two-of-three-beyond-2-sigma'] = 'Two of three beyond 2 sigma';
RULE_LABELS['fifteen-within-1-sigma'] = 'Fifteen hugging the centre line';
export const signalRuleLabel = (rule: string) => RULE_LABELS[rule] ?? rule;

function favourable(m: MeasureDefinition, d: ChartSignal['direction']): boolean | null {
  if (d === 'none') return null;
  const good = m.better === 'lower' ? ['below', 'falling'] : ['above', 'rising'];
  return good.includes(d);
}

function verdict(m: MeasureDefinition, d: ChartSignal['direction']): string {
  const f = favourable(m, d);
  if (f === null) return 'It says the variation is not random, without a direction.';
  return `${m.better === 'lower' ? 'Lower' : 'Higher'} is better for this measure: this looks like ${f ? 'an improvement' : 'a deterioration'}.`;
}

interface Built { points: ChartPoint[]; phases: ChartPhase[]; signals: ChartSignal[] }

/** Runs one phase: its run chart and control chart, and turns their findings into signals. */
function buildPhase(m: MeasureDefinition, inputs: PeriodInput[], phaseIndex: number, baselineEnd: string | null, opts: BuildOptions, out: Built) {
  const values = inputs.map((p) => periodValue(m, p));
  const present = values.map((v, i) => (v === null ? -1 : i)).filter((i) => i >= 0);
  const small = opts.smallCount ?? 20;
  const first = out.points.length;
  const points: ChartPoint[] = inputs.map((p, i) => ({
    period: p.period, numerator: p.numerator, denominator: p.denominator, value: values[i] === null ? null : round(values[i]!, 6),
    provisional: p.provisional, phase: phaseIndex, inBaseline: false, centre: null, lower: null, upper: null, median: null,
    outside: false, signals: [], smallCount: m.kind !== 'individuals' ? p.denominator > 0 && p.denominator < small : p.denominator > 0 && p.denominator < 5,
  }));
  out.points.push(...points);
  if (!present.length) {
    out.phases.push({ index: phaseIndex, startPeriod: inputs[0].period, endPeriod: inputs[inputs.length - 1].period, baselinePoints: 0, median: null, centre: null, useful: 0, longestRun: 0, longestRunLimit: null, crossings: 0, crossingsLimit: null });
    return;
  }
  let baseline = Math.min(opts.defaultBaseline ?? DEFAULT_BASELINE_MONTHS, present.length);
  if (baselineEnd) baseline = Math.max(1, present.filter((i) => inputs[i].period <= baselineEnd).length);
  for (const i of present.slice(0, baseline)) points[i].inBaseline = true;

  const run = runChart(values, { baseline });
  for (const p of points) p.median = round(run.median, 6);

  // The matching control chart, on the periods that have a value.
  const scale = m.kind === 'proportion' ? 100 : 1;
  let chart: ControlChart<number | null>;
  if (m.kind === 'proportion') chart = pChart(present.map((i) => ({ events: inputs[i].numerator, total: inputs[i].denominator })), { baseline });
  else if (m.kind === 'rate') chart = uChart(present.map((i) => ({ events: inputs[i].numerator, exposure: inputs[i].denominator })), { per: m.per ?? 1000, baseline });
  else chart = iChart(present.map((i) => values[i]!), { baseline });
  present.forEach((i, k) => {
    const c = chart.points[k];
    points[i].centre = round(chart.centre * scale, 6);
    points[i].lower = c.lower === null ? null : round(c.lower * scale, 6);
    points[i].upper = c.upper === null ? null : round(c.upper * scale, 6);
    points[i].outside = c.outside;
  });

  const period = (i: number) => inputs[i].period;
  const add = (s: Omit<ChartSignal, 'id' | 'favourable' | 'provisional' | 'label' | 'phase'>, startIdx: number, endIdx: number) => {
    const id = `${s.chart}:${s.rule}:${phaseIndex}:${s.startPeriod}`;
    const provisional = points.slice(startIdx, endIdx + 1).some((p) => p.provisional);
    out.signals.push({ ...s, id, phase: phaseIndex, label: signalRuleLabel(s.rule), favourable: favourable(m, s.direction), provisional });
    // Anhøj's run-count rules speak of the whole phase, not of points: they are listed, not marked.
    if (s.rule === 'longest-run' || s.rule === 'few-crossings') return;
    for (let i = startIdx; i <= endIdx; i++) if (values[i] !== null) points[i].signals.push(id);
  };
  const span = (a: number, b: number) => (a === b ? monthLabel(period(a)) : `${monthLabel(period(a))} to ${monthLabel(period(b))}`);
  const countBetween = (a: number, b: number) => present.filter((i) => i >= a && i <= b).length;
  const med = fmt(m, run.median);
  const unitWord = inputs[0].period.includes('Q') ? 'quarters' : 'months';

  for (const s of run.shifts) {
    const dir = values[s.start]! > run.median ? 'above' : 'below';
    const n = present.filter((i) => i >= s.start && i <= s.end && values[i] !== run.median).length;
    add({ chart: 'run', rule: 'shift', direction: dir, startPeriod: period(s.start), endPeriod: period(s.end),
      explanation: `Shift: ${n} ${unitWord} in a row ${dir} the baseline median of ${med} (${span(s.start, s.end)}). Six or more consecutive points on one side of the median, points on the median skipped, is a non-random signal (Perla, Provost & Murray, BMJ Qual Saf 2011). ${verdict(m, dir)}` }, s.start, s.end);
  }
  for (const t of run.trends) {
    const dir = values[t.end]! > values[t.start]! ? 'rising' : 'falling';
    add({ chart: 'run', rule: 'trend', direction: dir, startPeriod: period(t.start), endPeriod: period(t.end),
      explanation: `Trend: ${countBetween(t.start, t.end)} ${unitWord} all ${dir} (${span(t.start, t.end)}). Five or more points all going up or all going down, equal neighbours counted once, is a non-random signal (Perla, Provost & Murray 2011). ${verdict(m, dir)}` }, t.start, t.end);
  }
  const phaseStart = present[0];
  const phaseEnd = present[present.length - 1];
  if (run.longestRunLimit !== null && run.longestRun > run.longestRunLimit) {
    add({ chart: 'run', rule: 'longest-run', direction: 'none', startPeriod: period(phaseStart), endPeriod: period(phaseEnd),
      explanation: `Unusually long run: the longest run on one side of the median is ${run.longestRun} points, above the limit of ${run.longestRunLimit} for ${run.useful} useful points (round(log2(n) + 3); Anhøj & Olesen, PLoS One 2014). The process has probably shifted.` }, phaseStart, phaseEnd);
  }
  if (run.crossingsLimit !== null && run.crossings < run.crossingsLimit) {
    add({ chart: 'run', rule: 'few-crossings', direction: 'none', startPeriod: period(phaseStart), endPeriod: period(phaseEnd),
      explanation: `Too few crossings: the line crosses the median ${run.crossings} times, fewer than the ${run.crossingsLimit} expected at least for ${run.useful} useful points (5th percentile of Binomial(n - 1, 0.5); Anhøj & Olesen, PLoS One 2014). Points cluster on one side: the process has probably shifted.` }, phaseStart, phaseEnd);
  }
  const centre = fmt(m, chart.centre * scale);
  // Consecutive points beyond the same limit are read as one finding (one line, not one per month).
  const merged: { rule: string; start: number; end: number }[] = chart.signals.filter((s) => s.rule !== 'outside-3-sigma').map((s) => ({ ...s }));
  const above = (i: number) => chart.points[i].value > chart.centre;
  let beyond: { rule: string; start: number; end: number } | null = null;
  for (const s of chart.signals.filter((x) => x.rule === 'outside-3-sigma')) {
    if (beyond && beyond.end === s.start - 1 && above(beyond.end) === above(s.start)) beyond.end = s.end;
    else {
      if (beyond) merged.push(beyond);
      beyond = { rule: s.rule, start: s.start, end: s.end };
    }
  }
  if (beyond) merged.push(beyond);
  merged.sort((x, y) => x.start - y.start || x.end - y.end);
  for (const s of merged) {
    const a = present[s.start];
    const b = present[s.end];
    let dir: ChartSignal['direction'] = 'none';
    if (s.rule === 'six-trend') dir = values[b]! > values[a]! ? 'rising' : 'falling';
    else if (s.rule !== 'fifteen-within-1-sigma') dir = chart.points[s.start].value > chart.centre ? 'above' : 'below';
    const what: Record<string, string> = {
      'outside-3-sigma': s.start === s.end
        ? `${monthLabel(period(a))} (${fmt(m, values[a])}) lies ${dir === 'above' ? 'above the upper' : 'below the lower'} 3-sigma control limit of the ${chartKindLabel(m.kind)} (centre ${centre}).`
        : `${countBetween(a, b)} ${unitWord} in a row (${span(a, b)}) lie ${dir === 'above' ? 'above the upper' : 'below the lower'} 3-sigma control limit of the ${chartKindLabel(m.kind)} (centre ${centre}).`,
      'eight-one-side': `${countBetween(a, b)} ${unitWord} in a row ${dir} the centre line of ${centre} (${span(a, b)}).`,
      'six-trend': `${countBetween(a, b)} ${unitWord} in a row all ${dir} (${span(a, b)}).`,
      'two-of-three-beyond-2-sigma': `Two of three consecutive ${unitWord} lie beyond 2 sigma ${dir} the centre line (${span(a, b)}).`,
      'fifteen-within-1-sigma': `${countBetween(a, b)} ${unitWord} in a row lie within 1 sigma of the centre line (${span(a, b)}): less variation than expected, often a sign that the limits are too wide (mixed data).`,
    };
    add({ chart: 'control', rule: s.rule, direction: dir, startPeriod: period(a), endPeriod: period(b),
      explanation: `${signalRuleLabel(s.rule)}: ${what[s.rule]} A special-cause rule of the Shewhart chart (Provost & Murray, The Health Care Data Guide 2011). ${verdict(m, dir)}` }, a, b);
  }
  out.phases.push({
    index: phaseIndex, startPeriod: inputs[0].period, endPeriod: inputs[inputs.length - 1].period, baselinePoints: baseline,
    median: round(run.median, 6), centre: round(chart.centre * scale, 6), useful: run.useful, longestRun: run.longestRun,
    longestRunLimit: run.longestRunLimit, crossings: run.crossings, crossingsLimit: run.crossingsLimit,
  });
  void first;
}

/**
 * The chart of one measure and scope.
 * @param inputs periods in time order (no gaps: a period with no cases has denominator 0)
 */
export function buildMeasureChart(
  m: MeasureDefinition,
  scope: { site: string; label: string },
  view: 'monthly' | 'quarterly',
  inputs: readonly PeriodInput[],
  annotations: Annotation[],
  opts: BuildOptions,
): ChartResponse {
  const out: Built = { points: [], phases: [], signals: [] };
  const cuts = [...new Set(opts.rebaseAt)].sort();
  let phase: PeriodInput[] = [];
  let index = 0;
  for (const p of inputs) {
    if (phase.length && cuts.some((c) => c > phase[phase.length - 1].period && c <= p.period)) {
      buildPhase(m, phase, index, index === 0 ? opts.baselineEnd : null, opts, out);
      index += 1;
      phase = [];
    }
    phase.push(p);
  }
  if (phase.length) buildPhase(m, phase, index, index === 0 ? opts.baselineEnd : null, opts, out);

  const closedSignals = out.signals.filter((s) => !s.provisional);
  const summary = out.points.length === 0
    ? 'No counted cases in this period yet.'
    : out.signals.length === 0
      ? `No signal: the variation looks random (common cause) over ${out.points.length} ${view === 'quarterly' ? 'quarters' : 'months'}.`
      : `${out.signals.length} signal${out.signals.length === 1 ? '' : 's'} (${closedSignals.length} on closed data): ${[...new Set(out.signals.map((s) => s.label))].join('; ')}.`;
  return {
    measure: { key: m.key, label: m.label, short: m.short, kind: m.kind, unit: m.unit, better: m.better, chart: chartKindLabel(m.kind) },
    scope, view, points: out.points, phases: out.phases, signals: out.signals, annotations, rareEventAdvice: null, summary,
  };
}
