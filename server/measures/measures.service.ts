/**
 * The measures catalogue with each measure's settings, and the chart data of a measure for a
 * site or the network: monthly inputs (SQL aggregates, closed months from the roll-up) turned
 * into periods, then into run and control charts by chart-build.ts.
 */
import { preparedRows } from '../db/prepared.js';
import type { DataSource } from 'typeorm';
import type { Annotation, ChartQuery, ChartResponse, GChartResponse } from '../../shared/committee/chart.js';
import { MEASURES, measureByKey, type MeasureDefinition, type MeasureKey, type MeasureSettings, type MeasureSettingsUpdate } from '../../shared/committee/measures.js';
import { gChart } from '../../analysis/index.js';
import { badRequest, notFound } from '../http/errors.js';
import { buildMeasureChart, medianOfFrequencies, signalRuleLabel, type PeriodInput } from './chart-build.js';
import type { MonthlyInputs } from './monthly-sql.js';
import { addMonths, currentMonth, monthLabel, monthRange, monthStart, quarterOf, toMonth } from './months.js';
import { readMonthly } from './rollup.js';

export type MeasureWithSettings = MeasureDefinition & MeasureSettings;

// The reads every chart makes besides its data, each a scalar subquery returning JSON, so that a
// chart asks for all of them in one round trip (chartReads) and each caller can ask for one.
const SETTINGS_SQL = `SELECT coalesce(json_agg(json_build_object('key', measure_key, 'enabled', enabled, 'bs', to_char(baseline_start, 'YYYY-MM'), 'be', to_char(baseline_end, 'YYYY-MM'))), '[]'::json)
  FROM committee_measure_settings`;
const CLOSED_SQL = `SELECT coalesce(json_agg(to_char(month, 'YYYY-MM')), '[]'::json) FROM committee_month_closes WHERE closed`;
const FIRST_MONTH_SQL = `SELECT to_char(min(surgery_date), 'YYYY-MM') FROM surgical_cases WHERE status IN ('complete', 'verified', 'locked')`;
/** For a site `$1` is its id; the network has no parameter. */
const labelSql = (site: string) => (site === 'network'
  ? `SELECT json_build_object('network', value->>'name') FROM settings WHERE key = 'network'`
  : `SELECT json_build_object('code', code, 'name', name) FROM sites WHERE id = $1`);
// createdAt as Date.toISOString() writes it (UTC, milliseconds).
const annotationsSql = (site: string) => `SELECT coalesce(json_agg(json_build_object('id', a.id, 'siteId', a.site_id, 'siteCode', s.code, 'month', to_char(a.month, 'YYYY-MM'), 'text', a.text,
    'createdBy', u.display_name, 'createdAt', to_char(a.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')) ORDER BY a.month, a.created_at), '[]'::json)
  FROM committee_annotations a LEFT JOIN sites s ON s.id = a.site_id LEFT JOIN users u ON u.id = a.created_by
  WHERE a.removed_at IS NULL AND ${site === 'network' ? 'TRUE' : 'a.site_id = $1'}`;
const siteParams = (site: string) => (site === 'network' ? [] : [site]);

type SettingsJson = { key: MeasureKey; enabled: boolean; bs: string | null; be: string | null }[];
function toSettings(rows: SettingsJson): Map<MeasureKey, MeasureSettings> {
  const map = new Map<MeasureKey, MeasureSettings>();
  for (const m of MEASURES) map.set(m.key, { enabled: true, baselineStart: null, baselineEnd: null });
  for (const r of rows) if (map.has(r.key)) map.set(r.key, { enabled: r.enabled, baselineStart: r.bs, baselineEnd: r.be });
  return map;
}
function toLabel(site: string, v: { network?: string | null; code?: string; name?: string } | null): string {
  if (site === 'network') return v?.network ? `${v.network} (network)` : 'Whole network';
  if (!v) throw notFound('the site');
  return `${v.name} (${v.code})`;
}
async function scalar<T>(ds: DataSource, sql: string, params: unknown[] = []): Promise<T> {
  const [row] = await preparedRows<{ v: T }>(ds, `SELECT (${sql}) AS v`, params);
  return row.v;
}

export async function measureSettings(ds: DataSource): Promise<Map<MeasureKey, MeasureSettings>> {
  return toSettings(await scalar<SettingsJson>(ds, SETTINGS_SQL));
}

export async function listMeasures(ds: DataSource): Promise<MeasureWithSettings[]> {
  const settings = await measureSettings(ds);
  return MEASURES.map((m) => ({ ...m, ...settings.get(m.key)! }));
}

export async function getMeasure(ds: DataSource, key: MeasureKey): Promise<MeasureWithSettings> {
  return (await listMeasures(ds)).find((m) => m.key === key)!;
}

/** Saves an admin's change; returns the old and new settings for the audit trail. */
export async function updateMeasureSettings(ds: DataSource, key: MeasureKey, change: MeasureSettingsUpdate, userId: string) {
  const old = (await measureSettings(ds)).get(key)!;
  const next: MeasureSettings = { ...old, ...Object.fromEntries(Object.entries(change).filter(([, v]) => v !== undefined)) };
  if (next.baselineStart && next.baselineEnd && next.baselineStart > next.baselineEnd) {
    throw badRequest('the baseline must end on or after its first month', 'set the first and the last month of the baseline', [{ path: 'baselineEnd', message: `is before baselineStart (${next.baselineStart})` }]);
  }
  await ds.query(
    `INSERT INTO committee_measure_settings (measure_key, enabled, baseline_start, baseline_end, updated_by, updated_at) VALUES ($1, $2, $3, $4, $5, now())
     ON CONFLICT (measure_key) DO UPDATE SET enabled = $2, baseline_start = $3, baseline_end = $4, updated_by = $5, updated_at = now()`,
    [key, next.enabled, next.baselineStart ? monthStart(next.baselineStart) : null, next.baselineEnd ? monthStart(next.baselineEnd) : null, userId],
  );
  return { old, next };
}

export async function closedMonths(ds: DataSource): Promise<Set<string>> {
  return new Set(await scalar<string[]>(ds, CLOSED_SQL));
}

export async function firstDataMonth(ds: DataSource): Promise<string | null> {
  return scalar<string | null>(ds, FIRST_MONTH_SQL);
}

export async function siteLabel(ds: DataSource, site: string): Promise<string> {
  return toLabel(site, await scalar(ds, labelSql(site), siteParams(site)));
}

/** The notes of a site's charts; the network's charts show the network's notes and every site's (with its code). */
export async function annotationsFor(ds: DataSource, site: string): Promise<Annotation[]> {
  return scalar<Annotation[]>(ds, annotationsSql(site), siteParams(site));
}

/** All of the above for one chart, in one statement (under load each round trip waits its turn). */
async function chartReads(ds: DataSource, site: string) {
  const [r] = await preparedRows<{ settings: SettingsJson; closed: string[]; first: string | null; label: never; annotations: Annotation[] }>(ds,
    `SELECT (${SETTINGS_SQL}) AS settings, (${CLOSED_SQL}) AS closed, (${FIRST_MONTH_SQL}) AS first, (${labelSql(site)}) AS label, (${annotationsSql(site)}) AS annotations`,
    siteParams(site));
  return { settings: toSettings(r.settings), closed: new Set(r.closed), firstMonth: r.first, label: toLabel(site, r.label), annotations: r.annotations };
}

/** One period's numerator, denominator and statistic from summed monthly inputs. */
function toPeriod(m: MeasureDefinition, period: string, rows: MonthlyInputs[], provisional: boolean): PeriodInput {
  if ('frequencies' in m.inputs) {
    const merged = new Map<number, number>();
    for (const r of rows) for (const [v, n] of r.losFrequencies) merged.set(v, (merged.get(v) ?? 0) + n);
    const freq = [...merged.entries()];
    const med = medianOfFrequencies(freq);
    return { period, numerator: med ?? 0, denominator: freq.reduce((s, [, n]) => s + n, 0), statistic: med, provisional };
  }
  const { numerator, denominator } = m.inputs;
  const num = rows.reduce((s, r) => s + Number(r[numerator]), 0);
  const den = rows.reduce((s, r) => s + Number(r[denominator]), 0);
  const statistic = m.kind === 'individuals' ? (den > 0 ? (num / den) * 100 : null) : undefined;
  return { period, numerator: m.kind === 'individuals' ? Number(num.toFixed(6)) : num, denominator: den, statistic, provisional };
}

export interface ChartContext { timeZone: string; now?: Date }

/** The months a chart covers: from the query, else the baseline start or the first data month, to the current month. */
export async function chartMonths(ds: DataSource, settings: MeasureSettings, q: Pick<ChartQuery, 'from' | 'to'>, c: ChartContext): Promise<string[]> {
  return monthsOfChart(settings, q, c, q.from ?? settings.baselineStart ? null : await firstDataMonth(ds));
}

/** The same with the first data month already read. */
function monthsOfChart(settings: MeasureSettings, q: Pick<ChartQuery, 'from' | 'to'>, c: ChartContext, firstMonth: string | null): string[] {
  const to = q.to ?? currentMonth(c.timeZone, c.now);
  const from = q.from ?? settings.baselineStart ?? firstMonth ?? to;
  if (from > to) throw badRequest(`the chart starts (${from}) after it ends (${to})`, 'choose a first month on or before the last');
  let months = monthRange(from, to);
  // Without an explicit start, a stray old case (e.g. a mistyped year) must not break the chart:
  // show the latest 120 months. An explicit request over the limit is refused.
  if (months.length > 120 && !q.from) months = months.slice(-120);
  if (months.length > 120) throw badRequest(`the chart would cover ${months.length} months`, 'choose at most 120 months (10 years)', [{ path: 'from', message: 'too far back' }]);
  return months;
}

/** The measure's periods (monthly or quarterly) for a site or the network. */
export async function measurePeriods(ds: DataSource, m: MeasureDefinition, site: string, months: string[], view: 'monthly' | 'quarterly', closed: Set<string>): Promise<PeriodInput[]> {
  const rows = await readMonthly(ds, months[0], months[months.length - 1], closed, site === 'network' ? null : [site]);
  return periodsFromRows(m, months, view, closed, rows);
}

/** Groups monthly inputs (already limited to the scope's sites) into the measure's periods. */
export function periodsFromRows(m: MeasureDefinition, months: string[], view: 'monthly' | 'quarterly', closed: ReadonlySet<string>, rows: readonly MonthlyInputs[]): PeriodInput[] {
  const key = (month: string) => (view === 'quarterly' ? quarterOf(month) : month);
  const byPeriod = new Map<string, { rows: MonthlyInputs[]; provisional: boolean }>();
  for (const month of months) {
    const k = key(month);
    if (!byPeriod.has(k)) byPeriod.set(k, { rows: [], provisional: false });
    if (!closed.has(month)) byPeriod.get(k)!.provisional = true;
  }
  for (const r of rows) byPeriod.get(key(r.month))?.rows.push(r);
  return [...byPeriod.entries()].map(([period, v]) => toPeriod(m, period, v.rows, v.provisional));
}

export async function measureChart(ds: DataSource, key: MeasureKey, q: ChartQuery, c: ChartContext): Promise<ChartResponse> {
  const r = await chartReads(ds, q.site);
  const settings = r.settings.get(key)!;
  const months = monthsOfChart(settings, q, c, r.firstMonth);
  const periods = await measurePeriods(ds, measureByKey(key), q.site, months, q.view, r.closed);
  return chartFromPeriods(ds, key, q, settings, periods, { label: r.label, annotations: r.annotations });
}

/** The chart of already-read periods (the packet and the signal e-mails read the inputs once for every measure). */
export async function chartFromPeriods(
  ds: DataSource, key: MeasureKey, q: ChartQuery, settings: MeasureSettings, periods: PeriodInput[],
  read?: { label: Awaited<ReturnType<typeof siteLabel>>; annotations: Awaited<ReturnType<typeof annotationsFor>> },
): Promise<ChartResponse> {
  const m = measureByKey(key);
  const [label, annotations] = read ? [read.label, read.annotations] : await Promise.all([siteLabel(ds, q.site), annotationsFor(ds, q.site)]);
  const annotated = new Set(annotations.map((a) => a.month));
  const bad = q.rebase.filter((r) => !annotated.has(r));
  if (bad.length) {
    throw badRequest(`a chart is re-based only from an annotated month; ${bad.join(', ')} ha${bad.length === 1 ? 's' : 've'} no note on this chart`, 'pin a note to the month first (e.g. "protocol introduced"), then re-base from it', bad.map((b) => ({ path: 'rebase', message: `${b} has no annotation` })));
  }
  const toPeriodKey = (month: string) => (q.view === 'quarterly' ? quarterOf(month) : month);
  const baselineEnd = settings.baselineEnd ? toPeriodKey(settings.baselineEnd) : null;
  const chart = buildMeasureChart(m, { site: q.site, label }, q.view, periods, annotations, {
    rebaseAt: q.rebase.map(toPeriodKey),
    baselineEnd,
    defaultBaseline: q.view === 'quarterly' ? 4 : 12,
  });
  chart.rareEventAdvice = rareEventAdvice(m, q.site, periods, q.view);
  return chart;
}

/** Fewer than one event expected per month at a site: the p-chart says little; offer the g-chart and the quarterly view. */
function rareEventAdvice(m: MeasureDefinition, site: string, periods: PeriodInput[], view: string): string | null {
  if (!m.rareEvent || site === 'network' || view === 'quarterly' || !periods.length) return null;
  const events = periods.reduce((s, p) => s + p.numerator, 0);
  if (events / periods.length >= 1) return null;
  return `Rare event at this site: ${events} event${events === 1 ? '' : 's'} in ${periods.length} months (fewer than one a month). Monthly limits are wide and most months show zero; read the g-chart (cases between events) or the quarterly view.`;
}

/** The event flag of each rare-event measure on a fact row `f` (codes of server/analysis/facts.ts). */
const G_FLAGS: Partial<Record<MeasureKey, string>> = {
  'any-ppc': '(f.event_types & 247 <> 0)',
  atelectasis: '(f.event_types & 1 <> 0)',
  pneumonia: 'f.pneumonia',
  'pneumonia-per-1000-patient-days': 'f.pneumonia',
  'respiratory-readmission-30d': `(f.readmitted AND EXISTS (SELECT 1 FROM surgical_cases sc WHERE sc.id = f.case_id AND sc.readmission_cause = 'respiratory'))`,
};

/**
 * g-chart: counted cases operated between consecutive events at a site (Benneyan 2001), from
 * one SQL pass with a running count of events (no case rows leave the database).
 */
export async function measureGChart(ds: DataSource, key: MeasureKey, site: string, q: Pick<ChartQuery, 'from' | 'to'>, c: ChartContext): Promise<GChartResponse> {
  const m = measureByKey(key);
  const flag = G_FLAGS[key];
  if (!flag || !m.rareEvent) throw badRequest(`the g-chart is for rare events; ${m.short} is not one`, `use it for: ${MEASURES.filter((x) => x.rareEvent).map((x) => x.short).join(', ')}`);
  const label = await siteLabel(ds, site);
  const settings = (await measureSettings(ds)).get(key)!;
  const months = await chartMonths(ds, settings, q, c);
  const rows: { between: number; eventMonth: string | null }[] = await ds.query(
    `WITH c AS (
       SELECT f.case_id, f.surgery_date, ${flag} AS ev FROM analysis_case_facts f
        WHERE f.status IN (2, 3, 4) AND f.month >= $2::date AND f.month < $3::date AND ($1::uuid IS NULL OR f.site_id = $1::uuid)
     ), o AS (
       SELECT ev, surgery_date, sum(ev::int) OVER (ORDER BY surgery_date, case_id ROWS UNBOUNDED PRECEDING) - ev::int AS grp FROM c
     )
     SELECT grp, count(*) FILTER (WHERE NOT ev)::int AS between, to_char(max(surgery_date) FILTER (WHERE ev), 'YYYY-MM') AS "eventMonth"
       FROM o GROUP BY grp ORDER BY grp`,
    [site === 'network' ? null : site, monthStart(months[0]), monthStart(addMonths(months[months.length - 1], 1))],
  );
  // The first group counts cases before the first event: not a "between" count.
  const closedGroups = rows.filter((r) => r.eventMonth !== null).slice(1);
  const last = rows[rows.length - 1];
  const sinceLast = last && last.eventMonth === null ? last.between : 0;
  const signals: GChartResponse['signals'] = [];
  let points: GChartResponse['points'] = [];
  let centre: number | null = null;
  if (closedGroups.length) {
    const chart = gChart(closedGroups.map((r) => r.between));
    centre = chart.centre;
    points = closedGroups.map((r, i) => ({ eventMonth: r.eventMonth!, between: r.between, lower: chart.points[i].lower, upper: chart.points[i].upper, outside: chart.points[i].outside }));
    for (const s of chart.signals) {
      const a = points[s.start];
      const b = points[s.end];
      const dir = s.rule === 'fifteen-within-1-sigma' ? 'none' : s.rule === 'six-trend' ? (b.between > a.between ? 'rising' : 'falling') : a.between > chart.centre ? 'above' : 'below';
      // More cases between events is better for every rare-event measure.
      const favourable = dir === 'none' ? null : dir === 'above' || dir === 'rising';
      signals.push({
        id: `g:${s.rule}:${s.start}`, chart: 'control', rule: s.rule, label: signalRuleLabel(s.rule), phase: 0, startPeriod: a.eventMonth, endPeriod: b.eventMonth,
        direction: dir, favourable, provisional: false,
        explanation: `${signalRuleLabel(s.rule)} on the g-chart (events ${s.start + 2} to ${s.end + 2}). A long gap between events (above the centre of ${centre.toFixed(1)} cases) is good news; short gaps mean events come closer together (Benneyan, Health Care Manag Sci 2001).`,
      });
    }
  }
  return {
    measure: { key: m.key, label: m.label }, scope: { site, label }, points, centre, sinceLast, signals,
    summary: closedGroups.length
      ? `${closedGroups.length + 1} events from ${monthLabel(months[0])}; on average ${centre!.toFixed(1)} counted cases between two events; ${sinceLast} cases since the last one.`
      : 'Fewer than two events in this period: no g-chart yet.',
  };
}

export { toMonth };
