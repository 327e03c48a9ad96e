/**
 * /api/analysis/*: JSON aggregates for a cohort (rates, cohort page, series, funnel), a
 * comparison of two cohorts, and an Excel workbook of each view. The cohort filter travels in
 * the query string in its one URL encoding (shared/analysis/cohort-filter.ts); a comparison
 * prefixes cohort A with "a." and cohort B with "b.".
 */
import type { Request } from 'express';
import type { Role } from '../../shared/auth/roles.js';
import { CohortFilterSchema, cohortFilterFromParams, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { AnalysisOptionsSchema, type AnalysisOptions } from '../../shared/analysis/results.js';
import { measureByKey } from '../../shared/analysis/measures.js';
import { area, currentUser, parse } from '../http/route.js';
import { badRequest } from '../http/errors.js';
import { ctx } from '../context.js';
import { audit, actor } from '../audit/audit.service.js';
import { cohortPage, cohortRates, compareCohorts, measureSeries, siteFunnel } from './analysis.service.js';
import { siteLabels, viewerOf } from './viewer.js';
import { buildWorkbook, cohortSheets, comparisonSheets, funnelSheets, seriesSheets, type SheetSpec } from './workbook.js';

/** Cohorts and comparisons: every role (researchers see aggregates only, suppressed). */
export const ANALYSIS_ROLES: Role[] = ['admin', 'abstractor', 'analyst', 'committee', 'researcher'];

const a = area('/api/analysis');

export function filterFromQuery(req: Request, prefix = ''): CohortFilter {
  return parse(CohortFilterSchema, cohortFilterFromParams(req.query as Record<string, unknown>, prefix), prefix ? `cohort ${prefix.replace('.', '').toUpperCase()} filter` : 'cohort filter');
}

export function optionsFromQuery(req: Request): AnalysisOptions {
  const q = req.query as Record<string, unknown>;
  const pick = Object.fromEntries(['level', 'grouping', 'measure', 'expected', 'b'].filter((k) => q[k] != null && q[k] !== '').map((k) => [k, q[k]]));
  return parse(AnalysisOptionsSchema, pick, 'analysis options');
}

a.get('/rates', ANALYSIS_ROLES, async (req) => cohortRates(ctx(req).readDs, filterFromQuery(req), optionsFromQuery(req), viewerOf(currentUser(req))));
a.get('/cohort', ANALYSIS_ROLES, async (req) => cohortPage(ctx(req).readDs, filterFromQuery(req), optionsFromQuery(req), viewerOf(currentUser(req))));
a.get('/compare', ANALYSIS_ROLES, async (req) => {
  const opts = optionsFromQuery(req);
  return compareCohorts(ctx(req).readDs, filterFromQuery(req, 'a.'), opts.b === 'rest' ? 'rest' : filterFromQuery(req, 'b.'), opts, viewerOf(currentUser(req)));
});
a.get('/series', ANALYSIS_ROLES, async (req) => measureSeries(ctx(req).readDs, filterFromQuery(req), optionsFromQuery(req), viewerOf(currentUser(req))));
a.get('/funnel', ANALYSIS_ROLES, async (req) => {
  const opts = optionsFromQuery(req);
  if (measureByKey(opts.measure).kind !== 'proportion') throw badRequest(`a funnel plot needs a proportion; ${opts.measure} is a rate`, 'choose any-ppc, atelectasis, pneumonia, respiratory-failure, readmission-30d or death-30d', [{ path: 'measure', message: 'must be a proportion measure' }]);
  return siteFunnel(ctx(req).readDs, filterFromQuery(req), opts, viewerOf(currentUser(req)));
});

const VIEWS = ['cohort', 'compare', 'series', 'funnel'] as const;
type View = (typeof VIEWS)[number];

/** GET /api/analysis/export/:view — the same data as the JSON route, as an Excel workbook. */
a.get('/export/:view', ANALYSIS_ROLES, async (req, res) => {
  const view = req.params.view as View;
  if (!VIEWS.includes(view)) throw badRequest(`there is no analysis view "${String(req.params.view)}" to export`, `use one of ${VIEWS.join(', ')}`, [{ path: 'view', message: 'unknown view' }]);
  const user = currentUser(req);
  const viewer = viewerOf(user);
  const ds = ctx(req).readDs;
  const opts = optionsFromQuery(req);
  const labels = await siteLabels(ds, viewer);
  const siteNames = new Map([...labels].map(([id, l]) => [id, l.label]));
  let sheets: SheetSpec[];
  let methods: string[];
  let filters: { label: string; filter: CohortFilter; siteNames?: Map<string, string> }[];
  let title: string;
  if (view === 'compare') {
    const fa = filterFromQuery(req, 'a.');
    const fb = opts.b === 'rest' ? 'rest' : filterFromQuery(req, 'b.');
    const c = await compareCohorts(ds, fa, fb, opts, viewer);
    sheets = comparisonSheets(c); methods = c.methods; title = 'Comparison of two cohorts';
    filters = [{ label: 'A', filter: fa, siteNames }, fb === 'rest' ? { label: 'B (rest of network)', filter: { from: fa.from, to: fa.to, statuses: fa.statuses }, siteNames } : { label: 'B', filter: fb, siteNames }];
  } else {
    const f = filterFromQuery(req);
    filters = [{ label: 'Cohort', filter: f, siteNames }];
    if (view === 'cohort') { const p = await cohortPage(ds, f, opts, viewer); sheets = cohortSheets(p); methods = p.methods; title = 'Cohort'; }
    else if (view === 'series') { const s = await measureSeries(ds, f, opts, viewer); sheets = seriesSheets(s); methods = s.methods; title = `Series: ${s.label} by ${s.grouping}`; }
    else {
      if (measureByKey(opts.measure).kind !== 'proportion') throw badRequest(`a funnel plot needs a proportion; ${opts.measure} is a rate`);
      const fu = await siteFunnel(ds, f, opts, viewer); sheets = funnelSheets(fu); methods = fu.methods; title = `Site funnel: ${fu.label}`;
    }
  }
  const at = new Date();
  const buf = await buildWorkbook({ title, user: `${user.displayName} <${user.email}>`, at, level: opts.level, filters, methods }, sheets);
  await audit(ctx(req).ds, { ...actor(req), action: 'export', entity: 'analysis', entityId: null, details: { view, query: req.originalUrl.split('?')[1] ?? '' } });
  res.setHeader('Content-Type', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
  res.setHeader('Content-Disposition', `attachment; filename="alveolog-${view}-${at.toISOString().slice(0, 10)}.xlsx"`);
  res.send(buf);
});

export const analysisRouter = a;
