import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { routeTable } from '../../../server/http/route.js';
import { startTestApp, type TestApp, type Client, type DemoKey } from '../helpers.js';
import { MATRIX, type Who } from './role-matrix.js';

// OWASP ASVS 4.0.3 V4.1.1 (access enforced on the server), V4.1.3 (least privilege),
// V4.2.1 (no access by changing an id): every declared route against every role and no session.
let t: TestApp;
const clients = new Map<Who, Client>();
const WHO: Record<Who, DemoKey> = { admin: 'admin', abstractor: 'abstractor', analyst: 'analyst', committee: 'committee', chair: 'chair', researcher: 'researcher' };

beforeAll(async () => {
  t = await startTestApp();
  for (const [who, key] of Object.entries(WHO) as [Who, DemoKey][]) clients.set(who, await t.as(key));
});
afterAll(async () => { await t.close(); });

function concrete(path: string) {
  return path.replace(/:[A-Za-z]+/g, () => randomUUID());
}

async function call(c: Client, method: string, path: string) {
  const url = concrete(path);
  switch (method) {
    case 'GET': return c.get(url);
    case 'POST': return c.post(url, {});
    case 'PUT': return c.put(url, {});
    case 'PATCH': return c.patch(url, {});
    case 'DELETE': return c.delete(url);
    default: throw new Error(method);
  }
}

const allowed = (rule: (typeof MATRIX)[string]['rule'], who: Who) =>
  rule === 'public' || rule === 'signed-in' || rule.includes(who) || (who === 'admin' && rule.includes('chair'));

describe('role-by-route matrix', () => {
  it('when the router declares a route, then the matrix has a row for it (and no stale rows)', () => {
    const declared = routeTable.map((r) => `${r.method} ${r.path}`);
    const missing = declared.filter((k) => !MATRIX[k]);
    const stale = Object.keys(MATRIX).filter((k) => !declared.includes(k));
    expect(missing, 'routes missing from tests/server/security/role-matrix.ts').toEqual([]);
    expect(stale, 'rows for routes that no longer exist').toEqual([]);
  });

  it('when signed out, then every non-public route answers 401 in the error envelope', async () => {
    const anon = await t.client().refreshCsrf();
    for (const r of routeTable) {
      const row = MATRIX[`${r.method} ${r.path}`];
      if (!row || row.rule === 'public') continue;
      const res = await call(anon, r.method, r.path);
      expect(res.status, `${r.method} ${r.path}`).toBe(401);
      expect(res.body.error.code).toBe('not_signed_in');
    }
  });

  for (const who of Object.keys(WHO) as Who[]) {
    it(`when signed in as ${who}, then forbidden routes answer 403 and allowed ones pass the guard`, async () => {
      const c = clients.get(who)!;
      for (const r of routeTable) {
        const row = MATRIX[`${r.method} ${r.path}`];
        if (!row || row.rule === 'public') continue;
        const may = allowed(row.rule, who);
        if (may && row.skipAllowed) continue;
        const res = await call(c, r.method, r.path);
        if (may) expect([401, 403], `${who} ${r.method} ${r.path} -> ${res.status} ${JSON.stringify(res.body?.error)}`).not.toContain(res.status);
        else {
          expect(res.status, `${who} ${r.method} ${r.path}`).toBe(403);
          expect(res.body.error.code).toBe('forbidden');
        }
      }
    });
  }
});
