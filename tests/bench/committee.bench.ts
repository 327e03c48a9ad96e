/**
 * Issue 7 on the 1,000,000-case registry: a measure's 60-month run chart and control chart data
 * (GET /api/measures/:key/chart), for the network and for one site, beside the bare SQL it rests
 * on (the roll-up rows of the closed months + the live monthly aggregate of the open months).
 * Target: < 200 ms. Set-up: the 60 months ending with the synthetic data's last month are closed
 * except the last two (as in use: months are closed as they end), which freezes their inputs
 * into the roll-up; the time of one month's roll-up refresh is recorded too.
 */
import type { Bench } from './harness.js';
import { refreshRollup, ROLLUP_SELECT_SQL } from '../../server/measures/rollup.js';
import { INPUT_SQL, LOS_SQL } from '../../server/measures/monthly-sql.js';
import { addMonths, monthRange, monthStart } from '../../server/measures/months.js';

export default async function committeeBench(b: Bench): Promise<void> {
  const [{ last }] = await b.ds.query(`SELECT to_char(max(surgery_date), 'YYYY-MM') AS last FROM surgical_cases WHERE registry_number LIKE 'SYN-%'`);
  const to: string = last;
  const from = addMonths(to, -59);
  const months = monthRange(from, to);
  const open = months.slice(-2);
  const closed = months.slice(0, -2);
  b.log(`committee: closing ${closed.length} months ${from}..${addMonths(to, -2)} (roll-up refresh), leaving ${open.join(', ')} open`);
  const t0 = Date.now();
  await b.ds.query(`DELETE FROM committee_month_closes WHERE month >= $1::date`, [monthStart(from)]);
  for (const m of closed) {
    await b.ds.transaction(async (tx) => {
      await refreshRollup(tx, m);
      await tx.query(`INSERT INTO committee_month_closes (month, closed, closed_at) VALUES ($1::date, true, now())`, [monthStart(m)]);
    });
  }
  b.log(`committee: ${closed.length} months rolled up in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  await b.time('committee month roll-up refresh (one month, at close)', 'network, one month', () => b.ds.transaction((tx) => refreshRollup(tx, closed[closed.length - 1])), { runs: 5, warmup: 1 });

  const c = await b.as('committee');
  const must = async (url: string) => {
    const r = await c.get(url);
    if (r.status !== 200) throw new Error(`${url} -> ${r.status} ${JSON.stringify(r.body).slice(0, 300)}`);
    const body = r.body as { points: unknown[] };
    if (body.points.length !== 60) throw new Error(`${url}: expected 60 points, got ${body.points.length}`);
    return body;
  };
  const bare = (siteIds: string[] | null) => [
    { text: ROLLUP_SELECT_SQL, values: [closed.map(monthStart), siteIds] },
    { text: INPUT_SQL, values: [monthStart(open[0]), monthStart(addMonths(to, 1)), siteIds] },
    { text: LOS_SQL, values: [monthStart(open[0]), monthStart(addMonths(to, 1)), siteIds] },
  ];
  const site = b.sites.HBR ?? Object.values(b.sites)[0];
  for (const key of ['any-ppc', 'pneumonia-per-1000-patient-days', 'median-length-of-stay']) {
    await b.time(`committee 60-month run + control chart (GET /api/measures/${key}/chart)`, 'network, 60 months', () => must(`/api/measures/${key}/chart?site=network&from=${from}&to=${to}`), { bareSql: bare(null), target: '< 200 ms' });
  }
  await b.time('committee 60-month run + control chart (GET /api/measures/any-ppc/chart)', 'one site, 60 months', () => must(`/api/measures/any-ppc/chart?site=${site}&from=${from}&to=${to}`), { bareSql: bare([site]), target: '< 200 ms' });
}
