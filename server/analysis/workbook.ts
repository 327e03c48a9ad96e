/**
 * Excel workbooks of the cohort, comparison, series and funnel views (exceljs): the results
 * with number formats, the filter definition, the methods, the date and the user. Text that a
 * spreadsheet could take for a formula (starting with = + - @, a tab or a carriage return) is
 * neutralised with a leading apostrophe (OWASP, CSV injection).
 */
import ExcelJS from 'exceljs';
import { AGE_BANDS, ADHERENCE_BANDS, COHORT_URL_PARAMS, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import type { CohortPage, Comparison, Funnel, MeasureResult, Series } from '../../shared/analysis/results.js';

export function neutralise(v: unknown): unknown {
  if (typeof v !== 'string') return v;
  return /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
}

export interface SheetSpec {
  name: string;
  columns: { header: string; key: string; width?: number; numFmt?: string }[];
  rows: Record<string, unknown>[];
}

export interface WorkbookMeta {
  title: string;
  user: string;
  at: Date;
  level: number;
  filters: { label: string; filter: CohortFilter; siteNames?: Map<string, string> }[];
  methods: string[];
}

const FIELD_LABELS: Record<keyof CohortFilter, string> = {
  from: 'Surgery from', to: 'Surgery to', sites: 'Sites', units: 'Units', procedureCategories: 'Procedure categories',
  incisionSites: 'Incision sites', approaches: 'Approaches', urgencies: 'Urgency', asaClasses: 'ASA classes',
  ariscatClasses: 'ARISCAT classes', ageBands: 'Age bands', sexes: 'Sex', therapy: 'Therapy received', modalities: 'Therapy modalities',
  firstTherapyMin: 'Days to first therapy, from', firstTherapyMax: 'Days to first therapy, to', adherenceBands: 'Adherence bands',
  statuses: 'Statuses', outcomeTypes: 'Outcome types',
};

/** The filter in words, one row per field set ("every counted case" when empty). */
export function describeFilter(filter: CohortFilter, siteNames?: Map<string, string>): { field: string; value: string }[] {
  const rows: { field: string; value: string }[] = [];
  for (const key of Object.keys(COHORT_URL_PARAMS) as (keyof CohortFilter)[]) {
    const v = filter[key];
    if (v == null || (Array.isArray(v) && !v.length)) continue;
    const list = Array.isArray(v) ? (v as string[]) : [String(v)];
    const words = list.map((x) =>
      key === 'sites' ? siteNames?.get(x) ?? x : key === 'ageBands' ? AGE_BANDS[x as keyof typeof AGE_BANDS]?.label ?? x : key === 'adherenceBands' ? ADHERENCE_BANDS[x as keyof typeof ADHERENCE_BANDS]?.label ?? x : x,
    );
    rows.push({ field: FIELD_LABELS[key], value: words.join(', ') });
  }
  if (!rows.some((r) => r.field === 'Statuses')) rows.push({ field: 'Statuses', value: 'complete, verified, locked (every status that counts in analyses)' });
  return rows;
}

export async function buildWorkbook(meta: WorkbookMeta, sheets: SheetSpec[]): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Alveolog';
  wb.created = meta.at;
  for (const s of sheets) {
    const ws = wb.addWorksheet(s.name.slice(0, 31));
    ws.columns = s.columns.map((c) => ({ header: c.header, key: c.key, width: c.width ?? 16, style: c.numFmt ? { numFmt: c.numFmt } : {} }));
    ws.getRow(1).font = { bold: true };
    ws.views = [{ state: 'frozen', ySplit: 1 }];
    for (const r of s.rows) {
      const { __fmt, ...values } = r as Record<string, unknown> & { __fmt?: string };
      const row = ws.addRow(Object.fromEntries(Object.entries(values).map(([k, v]) => [k, neutralise(v)])));
      // A rate per 1,000 in a column formatted for proportions keeps a plain number format.
      if (__fmt) for (const k of ['estimate', 'lower', 'upper']) if (s.columns.some((c) => c.key === k)) row.getCell(k).numFmt = __fmt;
    }
  }
  const f = wb.addWorksheet('Filter');
  f.columns = [{ header: 'Cohort', key: 'cohort', width: 14 }, { header: 'Field', key: 'field', width: 28 }, { header: 'Value', key: 'value', width: 80 }];
  f.getRow(1).font = { bold: true };
  for (const c of meta.filters) for (const r of describeFilter(c.filter, c.siteNames)) f.addRow({ cohort: neutralise(c.label), field: r.field, value: neutralise(r.value) });
  const m = wb.addWorksheet('Methods');
  m.columns = [{ header: 'Method', key: 'text', width: 140 }];
  m.getRow(1).font = { bold: true };
  for (const t of meta.methods) m.addRow({ text: neutralise(t) });
  const a = wb.addWorksheet('About');
  a.columns = [{ header: 'Item', key: 'k', width: 22 }, { header: 'Value', key: 'v', width: 60 }];
  a.getRow(1).font = { bold: true };
  a.addRow({ k: 'Workbook', v: neutralise(meta.title) });
  a.addRow({ k: 'Exported at', v: meta.at.toISOString() });
  a.addRow({ k: 'Exported by', v: neutralise(meta.user) });
  a.addRow({ k: 'Confidence level', v: `${Math.round(meta.level * 100)}%` });
  a.addRow({ k: 'Use', v: 'Surveillance and quality improvement only, not bedside decisions; local protocol and the clinician\u2019s judgement decide.' });
  return Buffer.from(await wb.xlsx.writeBuffer());
}

const measureColumns = [
  { header: 'Measure', key: 'label', width: 44 },
  { header: 'Events', key: 'events', width: 10, numFmt: '#,##0' },
  { header: 'Denominator', key: 'denominator', width: 14, numFmt: '#,##0' },
  { header: 'Estimate', key: 'estimate', width: 12, numFmt: '0.00%' },
  { header: 'Lower limit', key: 'lower', width: 12, numFmt: '0.00%' },
  { header: 'Upper limit', key: 'upper', width: 12, numFmt: '0.00%' },
  { header: 'Unit', key: 'unit', width: 24 },
  { header: 'Notes', key: 'notes', width: 50 },
];

/** Rates shown per 1,000 are not percentages: their cells keep the plain number format. */
function measureRow(m: MeasureResult, stratum?: string): Record<string, unknown> {
  return {
    ...(stratum ? { stratum } : {}),
    label: m.label, events: m.events, denominator: m.denominator,
    estimate: m.interval.estimate, lower: m.interval.lower, upper: m.interval.upper,
    unit: m.kind === 'rate' ? m.unit : 'proportion (cases)', notes: m.notes.join(' '),
    ...(m.kind === 'rate' ? { __fmt: '0.00' } : {}),
  };
}

export function cohortSheets(page: CohortPage): SheetSpec[] {
  const strataCols = [{ header: 'Stratum', key: 'stratum', width: 34 }, ...measureColumns];
  return [
    { name: 'Results', columns: measureColumns, rows: page.measures.map((m) => measureRow(m)) },
    { name: 'Completeness', columns: [{ header: 'Item', key: 'k', width: 34 }, { header: 'Value', key: 'v', width: 14, numFmt: '#,##0' }, { header: 'Share', key: 's', width: 10, numFmt: '0.0%' }], rows: [
      { k: 'Counted cases', v: page.completeness.cases },
      { k: 'Verified', v: page.completeness.verified, s: page.completeness.verifiedShare },
      { k: 'With a discharge date', v: page.completeness.discharged, s: page.completeness.dischargedShare },
      ...(page.completeness.warning ? [{ k: 'Warning', v: null, s: null, note: page.completeness.warning }] : []),
    ] },
    { name: 'By ARISCAT class', columns: strataCols, rows: page.byAriscat.flatMap((s) => s.measures.map((m) => measureRow(m, s.label))) },
    { name: 'By site', columns: strataCols, rows: page.bySite.flatMap((s) => s.measures.map((m) => measureRow(m, s.label))) },
    { name: 'Length of stay', columns: [{ header: 'Days', key: 'days', width: 10 }, { header: 'Cases', key: 'count', width: 10, numFmt: '#,##0' }], rows: [
      ...page.los.histogram.map((h) => ({ days: h.days, count: h.count })),
      { days: 'Median', count: page.los.median }, { days: 'Q1', count: page.los.q1 }, { days: 'Q3', count: page.los.q3 },
    ] },
  ];
}

export function comparisonSheets(c: Comparison): SheetSpec[] {
  const iv = (p: string) => [
    { header: `${p} estimate`, key: `${p}E`, width: 12, numFmt: '0.000' },
    { header: `${p} lower`, key: `${p}L`, width: 12, numFmt: '0.000' },
    { header: `${p} upper`, key: `${p}U`, width: 12, numFmt: '0.000' },
  ];
  return [
    {
      name: 'Comparison',
      columns: [
        { header: 'Outcome', key: 'label', width: 40 },
        { header: 'A events', key: 'aE', width: 10, numFmt: '#,##0' }, { header: 'A cases', key: 'aN', width: 10, numFmt: '#,##0' },
        { header: 'B events', key: 'bE', width: 10, numFmt: '#,##0' }, { header: 'B cases', key: 'bN', width: 10, numFmt: '#,##0' },
        ...iv('Risk difference'), ...iv('Risk ratio'), ...iv('Odds ratio'),
        { header: 'Fisher p', key: 'p', width: 10, numFmt: '0.0000' },
        { header: 'Observed (A)', key: 'o', width: 12, numFmt: '#,##0' }, { header: 'Expected (A)', key: 'e', width: 12, numFmt: '0.0' },
        ...iv('O/E'), ...iv('MH risk ratio'),
        { header: 'Notes', key: 'notes', width: 50 },
      ],
      rows: c.outcomes.map((o) => ({
        label: o.label, aE: o.a.events, aN: o.a.total, bE: o.b.events, bN: o.b.total,
        'Risk differenceE': o.difference.estimate, 'Risk differenceL': o.difference.lower, 'Risk differenceU': o.difference.upper,
        'Risk ratioE': o.riskRatio.estimate, 'Risk ratioL': o.riskRatio.lower, 'Risk ratioU': o.riskRatio.upper,
        'Odds ratioE': o.oddsRatio.estimate, 'Odds ratioL': o.oddsRatio.lower, 'Odds ratioU': o.oddsRatio.upper,
        p: o.fisherP, o: o.observedExpected.observed, e: o.observedExpected.expected,
        'O/EE': o.observedExpected.ratio.estimate, 'O/EL': o.observedExpected.ratio.lower, 'O/EU': o.observedExpected.ratio.upper,
        'MH risk ratioE': o.mantelHaenszel.estimate, 'MH risk ratioL': o.mantelHaenszel.lower, 'MH risk ratioU': o.mantelHaenszel.upper,
        notes: [...o.notes, o.observedExpected.note ?? ''].filter(Boolean).join(' '),
      })),
    },
    { name: 'Length of stay', columns: [{ header: 'Median A (days)', key: 'a', width: 16 }, { header: 'Median B (days)', key: 'b', width: 16 }, { header: 'Mann-Whitney U', key: 'u', width: 16 }, { header: 'p', key: 'p', width: 10, numFmt: '0.0000' }, { header: 'Note', key: 'n', width: 40 }],
      rows: [{ a: c.los.medianA, b: c.los.medianB, u: c.los.u, p: c.los.p, n: c.los.note }] },
    { name: 'Cohort A', columns: measureColumns, rows: c.a.measures.map((m) => measureRow(m)) },
    { name: c.bIsRest ? 'Rest of network' : 'Cohort B', columns: measureColumns, rows: c.b.measures.map((m) => measureRow(m)) },
  ];
}

export function seriesSheets(s: Series): SheetSpec[] {
  const fmt = s.unit === '%' ? '0.00%' : '0.00';
  return [{
    name: 'Series',
    columns: [
      { header: s.grouping === 'month' ? 'Month' : 'Quarter', key: 'period', width: 12 },
      { header: 'Events', key: 'events', width: 10, numFmt: '#,##0' }, { header: 'Denominator', key: 'denominator', width: 14, numFmt: '#,##0' },
      { header: 'Value', key: 'value', width: 10, numFmt: fmt }, { header: 'Lower limit', key: 'lower', width: 12, numFmt: fmt }, { header: 'Upper limit', key: 'upper', width: 12, numFmt: fmt },
      { header: 'Lower control limit', key: 'lcl', width: 18, numFmt: fmt }, { header: 'Upper control limit', key: 'ucl', width: 18, numFmt: fmt }, { header: 'Outside limits', key: 'outside', width: 14 },
    ],
    rows: s.points.map((p) => ({ ...p, outside: p.outside ? 'yes' : '' })),
  }];
}

export function funnelSheets(f: Funnel): SheetSpec[] {
  return [{
    name: 'Sites',
    columns: [{ header: 'Site', key: 'label', width: 36 }, { header: 'Events', key: 'events', width: 10, numFmt: '#,##0' }, { header: 'Cases', key: 'total', width: 10, numFmt: '#,##0' }, { header: 'Proportion', key: 'proportion', width: 12, numFmt: '0.00%' }, { header: 'Position against the funnel', key: 'position', width: 26 }],
    rows: f.sites.map((s) => ({ ...s })),
  }, {
    name: 'Funnel limits',
    columns: [{ header: 'Cases', key: 'size', width: 10 }, { header: '95% lower', key: 'lower95', width: 12, numFmt: '0.00%' }, { header: '95% upper', key: 'upper95', width: 12, numFmt: '0.00%' }, { header: '99.8% lower', key: 'lower998', width: 12, numFmt: '0.00%' }, { header: '99.8% upper', key: 'upper998', width: 12, numFmt: '0.00%' }],
    rows: f.curve,
  }];
}
