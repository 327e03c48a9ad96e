import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { routeTable } from '../../../server/http/route.js';
import { startTestApp, type TestApp } from '../helpers.js';

// OWASP ASVS 4.0.3 V4.2.2 / V13.2.3: every state-changing route refuses a request without the
// session's anti-CSRF token, whatever the role (generated from the route table).
let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t.close(); });

describe('CSRF on every state-changing route', () => {
  it('when a signed-in admin sends a write without the token, then each route answers 403 csrf_failed', async () => {
    const admin = await t.as('admin');
    const writes = routeTable.filter((r) => r.method !== 'GET');
    expect(writes.length).toBeGreaterThan(10);
    for (const r of writes) {
      const url = r.path.replace(/:[A-Za-z]+/g, () => randomUUID());
      const method = r.method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete';
      const res = await admin.agent[method](url).send({});
      expect(res.status, `${r.method} ${r.path}`).toBe(403);
      expect(res.body.error.code, `${r.method} ${r.path}`).toBe('csrf_failed');
    }
  });
});
