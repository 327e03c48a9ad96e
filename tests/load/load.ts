/**
 * The mixed workload of `npm run load`: several roles signed in before the timed window (sign-in
 * is not part of the mix), then 50 connections for 30 s of reads and writes on loopback.
 * Targets on the 2-core machine: 0 errors, p95 under 250 ms.
 */
import autocannon from 'autocannon';
import { DEMO_PASSWORD } from '../../server/db/seed/scenario.js';

const base = process.env.LOAD_URL ?? 'http://127.0.0.1:3990';
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 50);
const DURATION = Number(process.env.LOAD_SECONDS ?? 30);

interface Session { role: string; cookie: string; csrf: string }

async function signIn(email: string, role: string): Promise<Session> {
  const pre = await fetch(`${base}/api/auth/csrf`);
  let cookie = (pre.headers.get('set-cookie') ?? '').split(';')[0];
  const { csrfToken } = await pre.json();
  const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': csrfToken }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  if (!r.ok) throw new Error(`sign-in as ${email} failed: ${r.status}`);
  cookie = (r.headers.get('set-cookie') ?? cookie).split(';')[0];
  return { role, cookie, csrf: (await r.json()).csrfToken };
}

type Req = { method: 'GET' | 'POST' | 'PATCH'; path: string; body?: unknown; role: string };

/** Reads and writes that the product's users make all day; only routes that answer 2xx are kept. */
const CANDIDATES: Req[] = [
  { method: 'GET', path: '/api/auth/me', role: 'abstractor' },
  { method: 'GET', path: '/api/cases?page=1&pageSize=50&sort=surgeryDate.desc', role: 'abstractor' },
  { method: 'GET', path: '/api/cases?page=3&pageSize=25&status=verified', role: 'analyst' },
  { method: 'GET', path: '/api/worklist', role: 'abstractor' },
  { method: 'GET', path: '/api/sites', role: 'analyst' },
  { method: 'GET', path: '/api/dictionary', role: 'researcher' },
  { method: 'GET', path: '/api/measures', role: 'committee' },
  { method: 'GET', path: '/api/cohorts', role: 'analyst' },
  { method: 'GET', path: '/api/analysis/rates?from=2021-12-01&to=2026-11-30', role: 'analyst' },
  { method: 'GET', path: '/api/measures/any-ppc/chart?site=network', role: 'committee' },
  // The write: an analyst editing a saved cohort (an UPDATE and an audit entry in one
  // transaction). Creating a cohort per request would grow the analyst's list 20 times a second.
  { method: 'PATCH', path: '/api/cohorts/:edited', body: { description: 'edited under load' }, role: 'analyst' },
];

let written = 0;
/** Names of the cohorts this run writes (removed again at the end, so runs do not grow the data). */
const RUN = `Load-test cohort ${Date.now().toString(36)}`;

async function main() {
  const t0 = Date.now();
  const sessions: Record<string, Session> = {};
  for (const role of ['abstractor', 'analyst', 'committee', 'researcher', 'admin']) sessions[role] = await signIn(`${role}@tidewater.example`, role);
  const signInMs = (Date.now() - t0) / 5;
  // The cohorts the load edits, one per connection: 50 writers on one row would measure row-lock
  // waits (each behind the previous commit), which is not how analysts work.
  const a = sessions.analyst;
  const edited: string[] = [];
  for (let i = 0; i < CONNECTIONS; i++) {
    const made = await fetch(`${base}/api/cohorts`, { method: 'POST', headers: { cookie: a.cookie, 'x-csrf-token': a.csrf, 'content-type': 'application/json' }, body: JSON.stringify({ name: `${RUN} (edited under load, ${i + 1})`, filter: {}, shared: false }) });
    if (!made.ok) throw new Error(`could not create a cohort the load edits: ${made.status} ${await made.text()}`);
    edited.push(((await made.json()) as { id: string }).id);
  }
  for (const c of CANDIDATES) c.path = c.path.replace(':edited', edited[0]);
  const mix: Req[] = [];
  for (const c of CANDIDATES) {
    const s = sessions[c.role];
    const r = await fetch(`${base}${c.path}`, { method: c.method, headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, 'content-type': 'application/json' }, body: c.body ? JSON.stringify(c.body) : undefined });
    // Every request of the mix must work before the window: a failing one is a finding, not a skip.
    if (!r.ok) throw new Error(`${c.method} ${c.path} as ${c.role} answered ${r.status} before the load: ${(await r.text()).slice(0, 300)}`);
    await r.arrayBuffer();
    mix.push(c);
  }
  const writes = mix.filter((m) => m.method !== 'GET').length;
  // Each request alone (no concurrency), warm: shows which part of the mix costs what.
  const alone: Record<string, string> = {};
  for (const m of mix) {
    const s = sessions[m.role];
    const times: number[] = [];
    for (let i = 0; i < 12; i++) {
      const body = m.body ? JSON.stringify({ ...(m.body as object), description: `edited alone ${i}` }) : undefined;
      const t = performance.now();
      const r = await fetch(`${base}${m.path}`, { method: m.method, headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, 'content-type': 'application/json' }, body });
      await r.arrayBuffer();
      times.push(performance.now() - t);
    }
    times.sort((a, b) => a - b);
    alone[`${m.method} ${m.path.slice(0, 60)}`] = `${times[6].toFixed(1)} ms`;
  }
  console.log('each request alone (median of 12, warm):');
  console.table(alone);
  console.log(`bcrypt cost ${process.env.BCRYPT_COST ?? 12} (production setting): one sign-in took about ${signInMs.toFixed(0)} ms, outside the timed window`);
  console.log(`mix: ${mix.length} requests (${writes} writes), ${CONNECTIONS} connections, ${DURATION} s`);
  // A probe beside the load: each request of the mix in turn, timed under load, per route.
  const underLoad = new Map<string, number[]>();
  let probing = true;
  const probe = (async () => {
    await new Promise((r) => setTimeout(r, 2000));
    while (probing) {
      for (const m of mix) {
        if (!probing) break;
        const s = sessions[m.role];
        const t = performance.now();
        const r = await fetch(`${base}${m.path}`, { method: m.method, headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, 'content-type': 'application/json' }, body: m.body ? JSON.stringify({ ...(m.body as object), description: 'probe' }) : undefined });
        await r.arrayBuffer();
        const k = `${m.method} ${m.path.slice(0, 60)}`;
        underLoad.set(k, [...(underLoad.get(k) ?? []), performance.now() - t]);
      }
    }
  })();
  const latencies: number[] = [];
  let finish: (r: autocannon.Result) => void = () => undefined;
  let fail: (e: unknown) => void = () => undefined;
  const done = new Promise<autocannon.Result>((res, rej) => { finish = res; fail = rej; });
  const instance = autocannon({
    url: base,
    connections: CONNECTIONS,
    duration: DURATION,
    requests: mix.map((m) => ({
      method: m.method,
      path: m.path,
      headers: { cookie: sessions[m.role].cookie, 'x-csrf-token': sessions[m.role].csrf, 'content-type': 'application/json' },
      body: m.body ? JSON.stringify(m.body) : undefined,
      // Each edit writes a new description, so every request really changes the row.
      ...(m.method === 'PATCH'
        ? { setupRequest: (req: autocannon.Request) => ({ ...req, path: `/api/cohorts/${edited[written % edited.length]}`, body: JSON.stringify({ ...(m.body as object), description: `edited under load #${++written}` }) }) }
        : {}),
    })) as autocannon.Request[],
  }, (err, r) => (err ? fail(err) : finish(r)));
  // Every response's time, for an exact p95 (autocannon's summary stops at p90 and p97.5).
  instance.on('response', (_client: unknown, _status: number, _bytes: number, ms: number) => { latencies.push(ms); });
  const result = await done;
  probing = false;
  await probe;
  const q = (xs: number[], f: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(f * xs.length))];
  console.log('each request under load (the probe beside the load):');
  console.table(Object.fromEntries([...underLoad].map(([k, xs]) => [k, { n: xs.length, 'median ms': Math.round(q(xs, 0.5)), 'max ms': Math.round(q(xs, 1)) }])));
  const rows = [
    ['requests', String(result.requests.total)],
    ['throughput (req/s)', result.requests.average.toFixed(0)],
    ['latency p50 (ms)', String(result.latency.p50)],
    ['latency p95 (ms)', latencies.length ? q(latencies, 0.95).toFixed(0) : '-'],
    ['latency p97.5 (ms)', String(result.latency.p97_5)],
    ['latency p99 (ms)', String(result.latency.p99)],
    ['errors', String(result.errors)],
    ['timeouts', String(result.timeouts)],
    ['non-2xx', String(result.non2xx)],
  ];
  console.table(Object.fromEntries(rows));
  await removeRunCohorts(sessions.analyst);
  const p95 = Math.round(q(latencies, 0.95));
  const ok = result.errors === 0 && result.non2xx === 0 && result.timeouts === 0 && p95 < 250;
  console.log(`${ok ? 'target met' : 'TARGET MISSED'}: 0 errors and p95 < 250 ms (p95 ${p95} ms)`);
  process.exit(ok ? 0 : 1);
}

/** Deletes the saved cohorts this run created, through the API as their owner. */
async function removeRunCohorts(s: Session): Promise<void> {
  const headers = { cookie: s.cookie, 'x-csrf-token': s.csrf };
  const list = (await (await fetch(`${base}/api/cohorts`, { headers })).json()) as { items: { id: string; name: string; mine: boolean }[] };
  const mine = list.items.filter((c) => c.mine && c.name.startsWith('Load-test cohort'));
  for (const c of mine) {
    const r = await fetch(`${base}/api/cohorts/${c.id}`, { method: 'DELETE', headers });
    if (!r.ok) throw new Error(`could not remove the load-test cohort ${c.name}: ${r.status}`);
  }
  console.log(`removed the ${mine.length} saved cohorts written by load runs`);
}

main().catch((e) => { console.error(e); process.exit(1); });
