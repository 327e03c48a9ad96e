/**
 * Issue 4's analysis routes on the 1,000,000-case registry, each beside the bare SQL aggregate it
 * rests on. Targets (2-core machine): a cohort's rates < 150 ms, a 60-month series < 200 ms, a
 * two-cohort comparison < 300 ms, each within 1.5x of its bare SQL.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Bench, SqlQuery } from './harness.js';
import { keptAliveClient } from './http-client.js';
import { encodeCohortFilter, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { cellTotalsSql, losFrequenciesSql } from '../../server/analysis/queries.js';
import { networkFilterFor } from '../../server/analysis/analysis.service.js';
import { poolRows } from '../../server/db/pool-rows.js';

const qs = (f: CohortFilter, prefix = '', extra: Record<string, string> = {}) => {
  const p = encodeCohortFilter(f, prefix);
  for (const [k, v] of Object.entries(extra)) p.set(k, v);
  return p.toString();
};

export default async function analysisBench(b: Bench): Promise<void> {
  const c = await b.as('analyst');
  const must = async (url: string) => {
    const r = await c.get(url);
    if (r.status !== 200) throw new Error(`${url} -> ${r.status} ${JSON.stringify(r.body).slice(0, 300)}`);
    return r.body;
  };
  // The fixed cost of any signed-in API request (session and user lookup, JSON): the floor under every ratio.
  await b.time('baseline: signed-in request (GET /api/auth/me)', '-', () => must('/api/auth/me'));
  // The machine's own toll on a small query: a bare node:http server (no Express, no session, no
  // app) that runs SELECT pg_sleep(0.006), a small cohort's SQL time, and answers 2.6 kB; beside
  // the same SQL alone. Its ratio is what any HTTP route pays here over its SQL.
  const sleep = { text: 'SELECT pg_sleep(0.006)' };
  await b.time('platform: node:http + one 6 ms query, no app', '-', await platformProbe(b, sleep), { bareSql: sleep });
  for (const [name, f] of Object.entries(b.cohorts)) {
    const size = ((await must(`/api/analysis/rates?${qs(f)}`)) as { size: number }).size;
    b.log(`cohort ${name}: ${size.toLocaleString('en')} counted cases`);
    await b.time('cohort rates (GET /api/analysis/rates)', name, () => must(`/api/analysis/rates?${qs(f)}`), { bareSql: cellTotalsSql(f, []), target: '< 150 ms, ratio < 1.5' });
    // The same SQL behind the bare node:http server: what HTTP alone adds to this cohort's ratio.
    await b.time('platform: node:http + this cohort\'s rates SQL, no app', name, await platformProbe(b, cellTotalsSql(f, [])), { bareSql: cellTotalsSql(f, []) });
    await b.time('monthly series (GET /api/analysis/series)', name, () => must(`/api/analysis/series?${qs(f, '', { measure: 'any-ppc', grouping: 'month' })}`), { bareSql: cellTotalsSql(f, ['month']), target: '< 200 ms, ratio < 1.5' });
  }
  // Two cohorts: before vs after the protocol at one site; and a cohort against the rest of the network.
  const before: CohortFilter = { from: '2022-03-01', to: '2024-02-29', sites: [b.sites.HBR] };
  const after: CohortFilter = { from: '2024-03-01', to: '2025-12-31', sites: [b.sites.HBR] };
  await b.time('two-cohort comparison (GET /api/analysis/compare)', 'site before vs after protocol', () => must(`/api/analysis/compare?${qs(after, 'a.')}&${qs(before, 'b.')}`), {
    bareSql: [cellTotalsSql(after, ['ariscat']), cellTotalsSql(before, ['ariscat']), losFrequenciesSql(after), losFrequenciesSql(before)],
    target: '< 300 ms, ratio < 1.5',
  });
  const hi = b.cohorts['upper-abdominal-int-high'];
  await b.time('two-cohort comparison (GET /api/analysis/compare)', 'upper-abdominal int+high vs rest of network', () => must(`/api/analysis/compare?${qs(hi, 'a.')}&b=rest`), {
    bareSql: [cellTotalsSql(hi, ['ariscat']), cellTotalsSql(networkFilterFor(hi), ['ariscat']), losFrequenciesSql(hi), losFrequenciesSql(networkFilterFor(hi))],
    target: '< 300 ms, ratio < 1.5',
  });
  const net = b.cohorts['network-5y'];
  await b.time('site funnel (GET /api/analysis/funnel)', 'network-5y', () => must(`/api/analysis/funnel?${qs(net, '', { measure: 'any-ppc' })}`), { bareSql: cellTotalsSql(net, ['site']) });
  // Outside the roll-up's dimensions the narrow fact table answers (documented slower path).
  const wide: CohortFilter = { from: '2021-01-01', to: '2025-12-31', sexes: ['female'], asaClasses: ['III', 'IV'] };
  await b.time('cohort rates, fact-table path (GET /api/analysis/rates)', 'female ASA III-IV 5y', () => must(`/api/analysis/rates?${qs(wide)}`), { bareSql: cellTotalsSql(wide, []) });
}

/**
 * A GET against a throw-away node:http server that runs `q` on the app's own pool (the route's
 * transport and role) and answers 2.6 kB (a rates answer's size), on one kept-alive socket.
 */
async function platformProbe(b: Bench, q: SqlQuery): Promise<() => Promise<void>> {
  const body = JSON.stringify({ pad: 'x'.repeat(2600) });
  const server = http.createServer((_req, res) => {
    poolRows(b.ds, q.text, q.values ?? []).then(() => { res.setHeader('content-type', 'application/json'); res.end(body); }, () => { res.statusCode = 500; res.end(); });
  });
  server.listen(0, '127.0.0.1');
  await new Promise<void>((r) => server.once('listening', () => r()));
  server.unref();
  const { port } = server.address() as AddressInfo;
  const client = keptAliveClient(`http://127.0.0.1:${port}`);
  return async () => {
    const r = await client.get('/');
    if (r.status !== 200) throw new Error(`platform probe: ${r.status}`);
  };
}
