import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t.close(); });

describe('health', () => {
  it('when the database answers, then health says ok', async () => {
    const r = await t.client().get('/api/health');
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ status: 'ok', database: 'ok' });
  });

  it('when an unknown API route is called, then 404 comes in the error envelope', async () => {
    const r = await t.client().get('/api/no-such-thing');
    expect(r.status).toBe(404);
    expect(r.body.error.code).toBe('not_found');
  });

  it('when the body is malformed JSON, then 400 malformed_json comes back', async () => {
    const c = await t.client().refreshCsrf();
    const r = await c.agent.post('/api/auth/login').set('x-csrf-token', c.csrf).set('Content-Type', 'application/json').send('{"email": ');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('malformed_json');
  });
});
