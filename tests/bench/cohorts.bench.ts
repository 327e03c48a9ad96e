/**
 * Issue 6's cohort page and comparison on the 1,000,000-case registry, beside their bare SQL.
 * Targets: a cohort page's data < 300 ms, a comparison < 400 ms.
 */
import type { Bench } from './harness.js';
import { encodeCohortFilter, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { cellTotalsSql, losFrequenciesSql } from '../../server/analysis/queries.js';

const qs = (f: CohortFilter, prefix = '') => encodeCohortFilter(f, prefix).toString();

export default async function cohortsBench(b: Bench): Promise<void> {
  const c = await b.as('analyst');
  const must = async (url: string) => {
    const r = await c.get(url);
    if (r.status !== 200) throw new Error(`${url} -> ${r.status} ${JSON.stringify(r.body).slice(0, 300)}`);
    return r.body;
  };
  for (const [name, f] of Object.entries(b.cohorts)) {
    await b.time('cohort page (GET /api/analysis/cohort)', name, () => must(`/api/analysis/cohort?${qs(f)}`), {
      bareSql: [cellTotalsSql(f, ['site', 'ariscat']), losFrequenciesSql(f)],
      target: '< 300 ms',
    });
  }
  // "Therapy vs no therapy within high-risk patients" (issue 6's demo question).
  const therapy: CohortFilter = { from: '2021-01-01', to: '2025-12-31', ariscatClasses: ['high'], therapy: 'yes' };
  const none: CohortFilter = { ...therapy, therapy: 'no' };
  await b.time('comparison (GET /api/analysis/compare)', 'high risk: therapy vs none', () => must(`/api/analysis/compare?${qs(therapy, 'a.')}&${qs(none, 'b.')}&expected=ariscat-published`), {
    bareSql: [cellTotalsSql(therapy, ['ariscat']), cellTotalsSql(none, ['ariscat']), losFrequenciesSql(therapy), losFrequenciesSql(none)],
    target: '< 400 ms',
  });
  const r = await c.get(`/api/analysis/export/cohort?${qs(b.cohorts['network-5y'])}`);
  if (r.status !== 200) throw new Error(`export -> ${r.status}`);
  await b.time('cohort workbook (GET /api/analysis/export/cohort)', 'network-5y', () => c.get(`/api/analysis/export/cohort?${qs(b.cohorts['network-5y'])}`), { runs: 5, warmup: 1 });
}
