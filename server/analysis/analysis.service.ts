/**
 * The analysis service: SQL aggregates (server/analysis/queries.ts) fed to analysis/'s pure
 * statistics. Plain objects in and out; no req/res. Every figure carries its method in words.
 */
import type { DataSource } from 'typeorm';
import {
  compareMediansFromCounts,
  compareProportions,
  funnelLimits,
  mantelHaenszelRiskRatio,
  pChart,
  proportionInterval,
  rateInterval,
  runChart,
  standardizedRatio,
  suppressSmallCells,
  uChart,
} from '../../analysis/index.js';
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import {
  ARISCAT_PUBLISHED_CLASS_RISK,
  COHORT_PAGE_MEASURES,
  measureByKey,
  type MeasureDefinition,
  type MeasureKey,
} from '../../shared/analysis/measures.js';
import type {
  AnalysisOptions,
  CohortPage,
  Comparison,
  Funnel,
  MeasureResult,
  OutcomeComparison,
  RatesResult,
  Series,
  Stratum,
} from '../../shared/analysis/results.js';
import { ARISCAT_RISK_CLASS_LABELS } from '../../shared/clinical/scores.js';
import { ariscatOf, cellTotals, losFrequencies, sourceOf, type CellTotals } from './queries.js';
import { losHistogram, quantileFromCounts } from './los.js';
import { mayShowSite, siteLabels, type Viewer } from './viewer.js';

const pct = (l: number) => `${Math.round(l * 100)}%`;
const FEW_EVENTS = 10;
const SUPPRESS_MIN = 11;

export const METHODS = {
  proportion: (l: number) => `Proportions: events / counted cases with the Wilson score ${pct(l)} interval without continuity correction (Newcombe RG, Stat Med 1998;17:857-72).`,
  rate: (l: number) => `Rates: events per 1,000 post-operative patient-days (cases with a discharge date) with the exact Poisson ${pct(l)} interval (Garwood F, Biometrika 1936; Ulm K, Am J Epidemiol 1990).`,
  counted: 'Counted cases: status complete, verified or locked (drafts and withdrawn cases never count).',
  completeness: 'Completeness: share of counted cases that are verified (verified or locked) and share with a discharge date (needed for length of stay and patient-days).',
  los: 'Length of stay: discharge date minus admission date in days; median and quartiles by R type 7 (Hyndman & Fan 1996) from the frequency table.',
  compare: (l: number) => `Comparisons of A with B: risk difference with Newcombe's hybrid score ${pct(l)} interval (method 10, Stat Med 1998;17:873-90); risk ratio with the log (Katz) interval; odds ratio with Woolf's logit interval (0.5 added to every cell when one is zero); two-sided Fisher exact p.`,
  oe: (from: string) =>
    `Risk adjustment: observed / expected events in A with the exact Poisson interval; expected = sum over ARISCAT classes of A's cases x ${from === 'reference' ? "B's rate in that class" : "ARISCAT's published class risk (low 1.6%, intermediate 13.3%, high 42.1%; Canet J et al., Anesthesiology 2010;113:1338-50; any PPC only)"}. Cases without an ARISCAT class are left out of O/E and Mantel-Haenszel.`,
  mh: 'Mantel-Haenszel risk ratio of A vs B across ARISCAT classes (classes where both have cases) with the Greenland-Robins variance (Biometrics 1985;41:55-68).',
  mannWhitney: 'Length of stay A vs B: Mann-Whitney U with the normal approximation, tie and continuity corrections (as R wilcox.test(exact = FALSE, correct = TRUE)).',
  suppression: 'Counts from 1 to 10, and any count that would reveal one, are hidden (CMS cell-size suppression policy); sites are coded.',
  pchart: 'Control limits: p-chart (3-sigma limits per subgroup size) or u-chart for rates (Provost LP, Murray SK, The Health Care Data Guide 2011); run-chart rules of Anhoej & Olesen (PLoS One 2014) and Perla et al. (BMJ Qual Saf 2011).',
  funnel: 'Funnel plot: each site\'s proportion against its number of cases, with 95% and 99.8% limits around the network proportion by the exact binomial with interpolation (Spiegelhalter DJ, Stat Med 2005;24:1185-1202).',
  caution: 'For surveillance and quality improvement only, not for bedside decisions: local protocol and the clinician\'s judgement decide.',
};

const NULL_INTERVAL = { estimate: null, lower: null, upper: null };

/** Calls an analysis function; degenerate input it refuses (e.g. 0 cases) gives nulls. */
function safe<T, F>(f: () => T, fallback: F): T | F {
  try {
    return f();
  } catch {
    return fallback;
  }
}

function emptyTotals(): CellTotals {
  return { groups: {}, n: 0, verified: 0, discharged: 0, patientDays: 0, pneumoniaDischarged: 0, outcomes: { anyPpc: 0, atelectasis: 0, pneumoniaNhsn: 0, respiratoryInfection: 0, respiratoryFailure: 0, reintubation: 0, ards: 0, readmitted30d: 0, died30d: 0 } };
}

export function sumTotals(list: readonly CellTotals[]): CellTotals {
  const t = emptyTotals();
  for (const c of list) {
    t.n += c.n; t.verified += c.verified; t.discharged += c.discharged; t.patientDays += c.patientDays; t.pneumoniaDischarged += c.pneumoniaDischarged;
    for (const k of Object.keys(t.outcomes) as (keyof CellTotals['outcomes'])[]) t.outcomes[k] += c.outcomes[k];
  }
  return t;
}

function minusTotals(a: CellTotals, b: CellTotals): CellTotals {
  const t = sumTotals([a]);
  t.n -= b.n; t.verified -= b.verified; t.discharged -= b.discharged; t.patientDays -= b.patientDays; t.pneumoniaDischarged -= b.pneumoniaDischarged;
  for (const k of Object.keys(t.outcomes) as (keyof CellTotals['outcomes'])[]) t.outcomes[k] -= b.outcomes[k];
  return t;
}

/** Events and denominator of a measure in a set of totals. */
export function measureCounts(m: MeasureDefinition, t: CellTotals): { events: number; denominator: number } {
  if (m.kind === 'rate') {
    if (m.outcome !== 'pneumoniaNhsn') throw new Error(`rate measure ${m.key}: only pneumonia has a per-patient-day numerator in the analysis tables`);
    return { events: t.pneumoniaDischarged, denominator: t.patientDays };
  }
  return { events: t.outcomes[m.outcome], denominator: t.n };
}

function fewEventsNote(events: number | null): string[] {
  if (events == null) return ['Suppressed: a count from 1 to 10.'];
  return events < FEW_EVENTS ? [`Fewer than ${FEW_EVENTS} events (${events}): interpret with caution.`] : [];
}

/** One measure's result, suppressed for researchers. */
export function measureResult(m: MeasureDefinition, t: CellTotals, level: number, viewer: Viewer): MeasureResult {
  const { events, denominator } = measureCounts(m, t);
  let ev: number | null = events;
  let den: number | null = denominator;
  if (viewer.suppress) {
    const s = m.kind === 'proportion'
      ? suppressSmallCells({ rows: [[events, denominator - events]], rowTotals: [denominator] }, { min: SUPPRESS_MIN })
      : suppressSmallCells({ rows: [[events]] }, { min: SUPPRESS_MIN });
    ev = s.rows[0][0];
    if (m.kind === 'proportion') den = s.rowTotals?.[0] ?? null;
  }
  const hidden = ev == null || den == null;
  const interval = hidden || denominator <= 0
    ? NULL_INTERVAL
    : m.kind === 'rate'
      ? safe(() => rateInterval(events, denominator, { per: m.per ?? 1000, level }), NULL_INTERVAL)
      : safe(() => proportionInterval(events, denominator, { level }), NULL_INTERVAL);
  const notes = denominator <= 0 ? [m.kind === 'rate' ? 'No patient-days (no counted case with a discharge date).' : 'No counted cases.'] : fewEventsNote(ev);
  return { key: m.key as MeasureKey, label: m.label, kind: m.kind, unit: m.unit, events: ev, denominator: den, interval, notes };
}

function hideCount(n: number, viewer: Viewer): number | null {
  if (!viewer.suppress) return n;
  return suppressSmallCells({ rows: [[n]] }, { min: SUPPRESS_MIN }).rows[0][0];
}

function completeness(t: CellTotals, viewer: Viewer): RatesResult['completeness'] {
  const verifiedShare = t.n ? t.verified / t.n : null;
  const dischargedShare = t.n ? t.discharged / t.n : null;
  const warn: string[] = [];
  if (verifiedShare != null && verifiedShare < 0.9) warn.push(`only ${Math.round(verifiedShare * 100)}% of the cases are verified`);
  if (dischargedShare != null && dischargedShare < 0.9) warn.push(`only ${Math.round(dischargedShare * 100)}% have a discharge date`);
  return {
    cases: hideCount(t.n, viewer),
    verified: hideCount(t.verified, viewer),
    verifiedShare: viewer.suppress && hideCount(t.verified, viewer) == null ? null : verifiedShare,
    discharged: hideCount(t.discharged, viewer),
    dischargedShare: viewer.suppress && hideCount(t.discharged, viewer) == null ? null : dischargedShare,
    warning: warn.length ? `Results rest on incomplete data: ${warn.join(' and ')}.` : null,
  };
}

function ratesFrom(t: CellTotals, filter: CohortFilter, opts: Pick<AnalysisOptions, 'level'>, viewer: Viewer): RatesResult {
  const methods = [METHODS.counted, METHODS.proportion(opts.level), METHODS.rate(opts.level), METHODS.completeness, METHODS.caution];
  if (viewer.suppress) methods.push(METHODS.suppression);
  const keys: MeasureKey[] = [...COHORT_PAGE_MEASURES, 'pneumonia-per-1000-patient-days'];
  return {
    size: hideCount(t.n, viewer),
    completeness: completeness(t, viewer),
    measures: keys.map((k) => measureResult(measureByKey(k), t, opts.level, viewer)),
    level: opts.level,
    source: sourceOf(filter),
    methods,
  };
}

/** GET /api/analysis/rates: a cohort's size, completeness and every outcome's rate. */
export async function cohortRates(ds: DataSource, filter: CohortFilter, opts: Pick<AnalysisOptions, 'level'>, viewer: Viewer): Promise<RatesResult> {
  const rows = await cellTotals(ds, filter, []);
  return ratesFrom(sumTotals(rows), filter, opts, viewer);
}

function losSummary(table: { value: number; count: number }[], viewer: Viewer): CohortPage['los'] {
  const n = table.reduce((s, r) => s + r.count, 0);
  const hist = losHistogram(table);
  const histogram = viewer.suppress && hist.length
    ? (() => {
        const s = suppressSmallCells({ rows: [hist.map((h) => h.count)], rowTotals: [n] }, { min: SUPPRESS_MIN });
        return hist.map((h, i) => ({ days: h.days, count: s.rows[0][i] }));
      })()
    : hist;
  const hideStats = viewer.suppress && hideCount(n, viewer) == null;
  return {
    cases: hideCount(n, viewer),
    median: hideStats ? null : quantileFromCounts(table, 0.5),
    q1: hideStats ? null : quantileFromCounts(table, 0.25),
    q3: hideStats ? null : quantileFromCounts(table, 0.75),
    histogram,
  };
}

/**
 * Strata of a cohort page, with a two-way suppression (stratum x {events, non-events}) per
 * measure for researchers so that no small count is derivable from the margins.
 */
function strataResults(groups: { key: string; label: string; totals: CellTotals }[], overall: CellTotals, level: number, viewer: Viewer): Stratum[] {
  const keys: MeasureKey[] = [...COHORT_PAGE_MEASURES];
  const out: Stratum[] = groups.map((g) => ({
    key: g.key,
    label: g.label,
    cases: g.totals.n,
    measures: keys.map((k) => measureResult(measureByKey(k), g.totals, level, { ...viewer, suppress: false })),
  }));
  if (!viewer.suppress || !groups.length) return out;
  const sizes = suppressSmallCells({ rows: groups.map((g) => [g.totals.n]), colTotals: [overall.n] }, { min: SUPPRESS_MIN });
  out.forEach((s, i) => (s.cases = sizes.rows[i][0]));
  keys.forEach((k, mi) => {
    const m = measureByKey(k);
    const table = suppressSmallCells({
      rows: groups.map((g) => { const c = measureCounts(m, g.totals); return [c.events, c.denominator - c.events]; }),
      rowTotals: groups.map((g) => g.totals.n),
    }, { min: SUPPRESS_MIN });
    out.forEach((s, i) => {
      const r = s.measures[mi];
      const ev = table.rows[i][0];
      const den = table.rowTotals?.[i] ?? null;
      s.measures[mi] = { ...r, events: ev, denominator: den, interval: ev == null || den == null || s.cases == null ? NULL_INTERVAL : r.interval, notes: ev == null ? ['Suppressed: a count from 1 to 10.'] : r.notes };
    });
  });
  return out;
}

const ARISCAT_ORDER = ['low', 'intermediate', 'high'] as const;

/** GET /api/analysis/cohort: the cohort page's data. */
export async function cohortPage(ds: DataSource, filter: CohortFilter, opts: Pick<AnalysisOptions, 'level'>, viewer: Viewer): Promise<CohortPage> {
  const [cells, los, labels] = await Promise.all([cellTotals(ds, filter, ['site', 'ariscat']), losFrequencies(ds, filter), siteLabels(ds, viewer)]);
  const overall = sumTotals(cells);
  const rates = ratesFrom(overall, filter, opts, viewer);
  const byClass = [...ARISCAT_ORDER, null].map((cls) => {
    const list = cells.filter((c) => ariscatOf(Number(c.groups.ariscat)) === cls);
    return { key: cls ?? 'unknown', label: cls ? `ARISCAT ${ARISCAT_RISK_CLASS_LABELS[cls]}` : 'No ARISCAT class recorded', totals: sumTotals(list) };
  }).filter((g) => g.totals.n > 0);
  const siteIds = [...new Set(cells.map((c) => String(c.groups.site)))].filter((id) => mayShowSite(viewer, id));
  const bySite = siteIds
    .map((id) => ({ key: labels.get(id)?.key ?? id, label: labels.get(id)?.label ?? 'Unknown site', totals: sumTotals(cells.filter((c) => c.groups.site === id)) }))
    .sort((a, b) => a.label.localeCompare(b.label));
  return {
    ...rates,
    methods: [...rates.methods, METHODS.los],
    los: losSummary(los, viewer),
    byAriscat: strataResults(byClass, overall, opts.level, viewer),
    bySite: strataResults(bySite, overall, opts.level, viewer),
    siteVisibility: viewer.visibility,
  };
}

/** The "rest of the network" for a cohort: counted cases of the same surgery dates and statuses that are not in A. */
export function networkFilterFor(a: CohortFilter): CohortFilter {
  return { from: a.from, to: a.to, statuses: a.statuses };
}

function subtractLos(net: { value: number; count: number }[], a: { value: number; count: number }[]) {
  const m = new Map(net.map((r) => [r.value, r.count]));
  for (const r of a) m.set(r.value, (m.get(r.value) ?? 0) - r.count);
  return [...m.entries()].filter(([, c]) => c > 0).map(([value, count]) => ({ value, count })).sort((x, y) => x.value - y.value);
}

function byAriscat(cells: CellTotals[]): Map<string, CellTotals> {
  const m = new Map<string, CellTotals>();
  for (const cls of ARISCAT_ORDER) m.set(cls, sumTotals(cells.filter((c) => ariscatOf(Number(c.groups.ariscat)) === cls)));
  return m;
}

/** GET /api/analysis/compare: cohort A against cohort B or the rest of the network. */
export async function compareCohorts(ds: DataSource, a: CohortFilter, b: CohortFilter | 'rest', opts: Pick<AnalysisOptions, 'level' | 'expected'>, viewer: Viewer): Promise<Comparison> {
  const bFilter = b === 'rest' ? networkFilterFor(a) : b;
  const [cellsA, cellsB, losA, losB] = await Promise.all([
    cellTotals(ds, a, ['ariscat']), cellTotals(ds, bFilter, ['ariscat']), losFrequencies(ds, a), losFrequencies(ds, bFilter),
  ]);
  const classesA = byAriscat(cellsA);
  let classesB = byAriscat(cellsB);
  const totA = sumTotals(cellsA);
  let totB = sumTotals(cellsB);
  let losBTable = losB;
  if (b === 'rest') {
    totB = minusTotals(totB, totA);
    classesB = new Map([...classesB].map(([k, v]) => [k, minusTotals(v, classesA.get(k) ?? emptyTotals())]));
    losBTable = subtractLos(losB, losA);
  }
  const level = opts.level;
  const outcomes: OutcomeComparison[] = COHORT_PAGE_MEASURES.map((key) => {
    const m = measureByKey(key);
    const ca = measureCounts(m, totA);
    const cb = measureCounts(m, totB);
    const cmp = ca.denominator > 0 && cb.denominator > 0 ? safe(() => compareProportions({ events: ca.events, total: ca.denominator }, { events: cb.events, total: cb.denominator }, { level }), null) : null;
    // Risk adjustment over ARISCAT classes.
    let observed = 0;
    let expected = 0;
    let oeNote: string | null = null;
    const strata: { a: { events: number; total: number }; b: { events: number; total: number } }[] = [];
    for (const cls of ARISCAT_ORDER) {
      const sa = measureCounts(m, classesA.get(cls) ?? emptyTotals());
      const sb = measureCounts(m, classesB.get(cls) ?? emptyTotals());
      observed += sa.events;
      if (opts.expected === 'reference') {
        if (sa.denominator > 0 && sb.denominator === 0) oeNote = `B has no ${cls}-risk cases: A's ${cls}-risk cases have no expected rate and are left out.`;
        if (sb.denominator > 0) expected += sa.denominator * (sb.events / sb.denominator);
        else observed -= sa.events;
      } else if (m.outcome === 'anyPpc') expected += sa.denominator * ARISCAT_PUBLISHED_CLASS_RISK[cls];
      if (sa.denominator > 0 && sb.denominator > 0) strata.push({ a: { events: sa.events, total: sa.denominator }, b: { events: sb.events, total: sb.denominator } });
    }
    const published = opts.expected === 'ariscat-published' && m.outcome !== 'anyPpc';
    if (published) oeNote = "ARISCAT's published class risks are for any PPC only.";
    const ratio = !published && expected > 0 ? safe(() => standardizedRatio(observed, expected, { level }), NULL_INTERVAL) : NULL_INTERVAL;
    const mh = strata.length ? safe(() => mantelHaenszelRiskRatio(strata, { level }), NULL_INTERVAL) : NULL_INTERVAL;
    const notes: string[] = [];
    if (ca.events < FEW_EVENTS || cb.events < FEW_EVENTS) notes.push(`Fewer than ${FEW_EVENTS} events in ${ca.events < FEW_EVENTS && cb.events < FEW_EVENTS ? 'both cohorts' : ca.events < FEW_EVENTS ? 'A' : 'B'}: interpret with caution.`);
    if (!cmp) notes.push('A cohort has no counted cases: no comparison.');
    const hide = viewer.suppress && [ca.events, cb.events, ca.denominator - ca.events, cb.denominator - cb.events].some((x) => x >= 1 && x < SUPPRESS_MIN);
    if (hide) notes.push('Suppressed: a count from 1 to 10 would be revealed.');
    return {
      key: key,
      label: m.label,
      a: { events: hide ? null : ca.events, total: hideCount(ca.denominator, viewer) },
      b: { events: hide ? null : cb.events, total: hideCount(cb.denominator, viewer) },
      difference: hide || !cmp ? NULL_INTERVAL : cmp.difference,
      riskRatio: hide || !cmp ? NULL_INTERVAL : cmp.riskRatio,
      oddsRatio: hide || !cmp ? NULL_INTERVAL : cmp.oddsRatio,
      fisherP: hide || !cmp ? null : cmp.fisherP,
      observedExpected: { observed: hide ? null : observed, expected: hide || published ? null : expected, ratio: hide ? NULL_INTERVAL : ratio, note: oeNote },
      mantelHaenszel: hide ? NULL_INTERVAL : mh,
      notes,
    };
  });
  const mw = losA.length && losBTable.length ? safe(() => compareMediansFromCounts(losA, losBTable), null) : null;
  const losHidden = viewer.suppress && [losA, losBTable].some((t) => { const n = t.reduce((s, r) => s + r.count, 0); return n >= 1 && n < SUPPRESS_MIN; });
  return {
    level,
    expected: opts.expected,
    bIsRest: b === 'rest',
    a: ratesFrom(totA, a, { level }, viewer),
    b: { ...ratesFrom(totB, bFilter, { level }, viewer), source: b === 'rest' ? sourceOf(a) : sourceOf(bFilter) },
    outcomes,
    los: mw && !losHidden
      ? { medianA: mw.medianA, medianB: mw.medianB, u: mw.u, p: mw.p, note: null }
      : { medianA: null, medianB: null, u: null, p: null, note: losHidden ? 'Suppressed: fewer than 11 cases.' : 'A cohort has no case with a length of stay.' },
    methods: [METHODS.counted, METHODS.compare(level), METHODS.oe(opts.expected), METHODS.mh, METHODS.mannWhitney, ...(b === 'rest' ? ['B is the rest of the network: counted cases of the same surgery dates and statuses that are not in A.'] : []), ...(viewer.suppress ? [METHODS.suppression] : []), METHODS.caution],
  };
}

/** Every period label from the first to the last (months 'YYYY-MM' or quarters 'YYYY-Qn'). */
export function periodsBetween(first: string, last: string, grouping: 'month' | 'quarter'): string[] {
  const toIndex = (p: string) => (grouping === 'month' ? Number(p.slice(0, 4)) * 12 + Number(p.slice(5, 7)) - 1 : Number(p.slice(0, 4)) * 4 + Number(p.slice(6)) - 1);
  const label = (i: number) => (grouping === 'month' ? `${Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, '0')}` : `${Math.floor(i / 4)}-Q${(i % 4) + 1}`);
  const out: string[] = [];
  for (let i = toIndex(first); i <= toIndex(last) && out.length < 1200; i++) out.push(label(i));
  return out;
}

function periodOf(date: string, grouping: 'month' | 'quarter'): string {
  return grouping === 'month' ? date.slice(0, 7) : `${date.slice(0, 4)}-Q${Math.floor((Number(date.slice(5, 7)) - 1) / 3) + 1}`;
}

/** GET /api/analysis/series: a measure per month or quarter with intervals, control limits and run-chart rules. */
export async function measureSeries(ds: DataSource, filter: CohortFilter, opts: Pick<AnalysisOptions, 'level' | 'grouping' | 'measure'>, viewer: Viewer): Promise<Series> {
  const m = measureByKey(opts.measure);
  const rows = await cellTotals(ds, filter, [opts.grouping]);
  const byPeriod = new Map(rows.map((r) => [String(r.groups[opts.grouping]), r]));
  const present = [...byPeriod.keys()].sort();
  const first = filter.from ? periodOf(filter.from, opts.grouping) : present[0];
  const last = filter.to ? periodOf(filter.to, opts.grouping) : present[present.length - 1];
  const periods = first && last ? periodsBetween(first, last, opts.grouping) : [];
  const results = periods.map((p) => measureResult(m, byPeriod.get(p) ?? emptyTotals(), opts.level, viewer));
  const counts = periods.map((p) => measureCounts(m, byPeriod.get(p) ?? emptyTotals()));
  const withCases = counts.map((c, i) => ({ c, i, shown: results[i].events != null && results[i].denominator != null })).filter((x) => x.c.denominator > 0 && x.shown);
  const chart = withCases.length
    ? safe(() => (m.kind === 'rate'
      ? uChart(withCases.map((x) => ({ events: x.c.events, exposure: x.c.denominator })), { per: m.per ?? 1000 })
      : pChart(withCases.map((x) => ({ events: x.c.events, total: x.c.denominator })))), null)
    : null;
  const limits = new Map<number, { lcl: number; ucl: number; outside: boolean }>();
  chart?.points.forEach((pt, j) => limits.set(withCases[j].i, { lcl: pt.lower, ucl: pt.upper, outside: pt.outside }));
  const values = results.map((r) => r.interval.estimate);
  const rc = values.some((v) => v != null) ? safe(() => runChart(values), null) : null;
  return {
    measure: opts.measure,
    label: m.label,
    unit: m.unit,
    grouping: opts.grouping,
    level: opts.level,
    centre: chart ? chart.centre : null,
    points: periods.map((p, i) => ({
      period: p,
      events: results[i].events,
      denominator: results[i].denominator,
      value: results[i].interval.estimate,
      lower: results[i].interval.lower,
      upper: results[i].interval.upper,
      lcl: limits.get(i)?.lcl ?? null,
      ucl: limits.get(i)?.ucl ?? null,
      outside: limits.get(i)?.outside ?? false,
    })),
    signals: (chart?.signals ?? []).map((s) => ({ rule: s.rule, start: withCases[s.start].i, end: withCases[s.end].i, startPeriod: periods[withCases[s.start].i], endPeriod: periods[withCases[s.end].i] })),
    runChart: rc ? { median: rc.median, shifts: rc.shifts, trends: rc.trends } : null,
    methods: [METHODS.counted, m.kind === 'rate' ? METHODS.rate(opts.level) : METHODS.proportion(opts.level), METHODS.pchart, ...(viewer.suppress ? [METHODS.suppression] : []), METHODS.caution],
  };
}

/** GET /api/analysis/funnel: each site's proportion against its case count with 95% and 99.8% limits. */
export async function siteFunnel(ds: DataSource, filter: CohortFilter, opts: Pick<AnalysisOptions, 'measure'>, viewer: Viewer): Promise<Funnel> {
  const m = measureByKey(opts.measure);
  if (m.kind !== 'proportion') throw new Error(`funnel plots are drawn for proportions; ${m.key} is a rate`);
  const [rows, labels] = await Promise.all([cellTotals(ds, filter, ['site']), siteLabels(ds, viewer)]);
  const total = sumTotals(rows);
  const net = measureCounts(m, total);
  const target = net.denominator > 0 ? net.events / net.denominator : null;
  // One exact-binomial pass over every size needed (the sites' and the curve's): its cost is O(n) per size.
  const maxN = Math.max(10, ...rows.map((r) => r.n));
  const curveSizes = [...new Set(Array.from({ length: 24 }, (_, i) => Math.max(1, Math.round(Math.exp((Math.log(maxN * 1.1) * (i + 1)) / 24)))))];
  const siteSizes = rows.map((r) => measureCounts(m, r).denominator).filter((n) => n > 0);
  const allSizes = [...new Set([...curveSizes, ...siteSizes])].sort((x, y) => x - y);
  const limitsBySize = new Map((target != null ? safe(() => funnelLimits(target, allSizes, { levels: [0.95, 0.998] }), []) : []).map((f) => [f.size, f]));
  const sites = rows.filter((r) => mayShowSite(viewer, String(r.groups.site))).map((r) => {
    const id = String(r.groups.site);
    const c = measureCounts(m, r);
    const lim = limitsBySize.get(c.denominator) ?? null;
    const p = c.events / c.denominator;
    const at = (lv: number) => lim?.limits.find((l) => l.level === lv);
    const l95 = at(0.95); const l998 = at(0.998);
    const position = !lim || !l95 || !l998 ? null : p > l998.upper ? 'above-99.8' : p > l95.upper ? 'above-95' : p < l998.lower ? 'below-99.8' : p < l95.lower ? 'below-95' : 'within';
    const hidden = viewer.suppress && [c.events, c.denominator - c.events].some((x) => x >= 1 && x < SUPPRESS_MIN);
    return {
      key: labels.get(id)?.key ?? id,
      label: labels.get(id)?.label ?? 'Unknown site',
      events: hidden ? null : c.events,
      total: hideCount(c.denominator, viewer),
      proportion: hidden ? null : p,
      position: hidden ? null : position,
    };
  }).sort((a, b) => a.label.localeCompare(b.label));
  const curve = curveSizes.flatMap((n) => {
    const f = limitsBySize.get(n);
    return f ? [{ size: n, lower95: f.limits[0].lower, upper95: f.limits[0].upper, lower998: f.limits[1].lower, upper998: f.limits[1].upper }] : [];
  });
  return {
    measure: opts.measure,
    label: m.label,
    target,
    siteVisibility: viewer.visibility,
    sites,
    curve,
    methods: [METHODS.counted, METHODS.funnel, ...(viewer.visibility === 'own-sites' ? ['Only your own sites are shown; the limits are around the network proportion.'] : []), ...(viewer.suppress ? [METHODS.suppression] : []), METHODS.caution],
  };
}

