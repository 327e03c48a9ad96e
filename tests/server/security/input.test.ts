import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';

// OWASP ASVS 4.0.3 V5 (validation, sanitisation) and V13.1 (API input): each bad input answers
// with the error envelope and changes nothing.
let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t.close(); });

const count = async (table: string) => (await t.ds.query(`SELECT count(*)::int AS n FROM ${table}`))[0].n as number;

describe('input handling', () => {
  it('when a JSON body is larger than the limit, then 413 too_large and nothing is written (V13.1.3)', async () => {
    const admin = await t.as('admin');
    const before = await count('sites');
    const r = await admin.post('/api/sites', { code: 'BIG1', name: 'x'.repeat(3 * 1024 * 1024) });
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe('too_large');
    expect(await count('sites')).toBe(before);
  });

  it('when SQL is typed into fields, then it is treated as data or refused, never executed (V5.3.4)', async () => {
    const admin = await t.as('admin');
    const before = await count('users');
    const r = await admin.post('/api/users', { email: "x'; DROP TABLE users; --@tidewater.example", displayName: 'x', roles: ['analyst'] });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.map((f: { path: string }) => f.path)).toContain('email');
    const site = await admin.post('/api/sites', { code: 'SQLI1', name: "Robert'); DROP TABLE sites;--" });
    expect(site.status).toBe(201);
    expect(site.body.name).toBe("Robert'); DROP TABLE sites;--");
    expect(await count('users')).toBe(before);
  });

  it('when an unknown role or a non-uuid id is sent, then 400 names the field', async () => {
    const admin = await t.as('admin');
    const r = await admin.post('/api/users', { email: 'new.person@tidewater.example', displayName: 'x', roles: ['superuser'] });
    expect(r.status).toBe(400);
    expect(r.body.error.fields[0].path).toMatch(/^roles/);
    const bad = await admin.get('/api/users/not-a-uuid');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('id');
  });

  it('when the server fails unexpectedly, then no stack trace leaves it (V7.4.1)', async () => {
    const admin = await t.as('admin');
    const r = await admin.get('/api/users/00000000-0000-0000-0000-000000000000');
    expect(r.status).toBe(404);
    expect(JSON.stringify(r.body)).not.toMatch(/at .*\.ts:\d+/);
  });
});
