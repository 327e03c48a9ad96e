import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { authenticator } from 'otplib';
import { startTestApp, demoEmail, type TestApp } from './helpers.js';

// OWASP ASVS 4.0.3 items named beside each test: V2 authentication, V3 session management.
let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t.close(); });

async function newUser(email: string, roles: string[] = ['analyst']) {
  const admin = await t.as('admin');
  const r = await admin.post('/api/users', { email, displayName: 'Test person', roles, siteIds: [] });
  expect(r.status).toBe(201);
  const [mail] = await t.mailTo(email);
  const token = /token=([\w-]+)/.exec(mail.body)![1];
  const accept = await t.client().refreshCsrf().then((c) => c.post('/api/auth/invitation/accept', { token, password: 'a quiet harbour at dawn' }));
  expect(accept.status).toBe(200);
  return r.body.id as string;
}

describe('sign-in and sign-out', () => {
  it('when the password is right, then the session user carries roles and sites and the event is audited (V2.1, V7.1)', async () => {
    const c = t.client();
    const r = await c.signIn(demoEmail('abstractor'));
    expect(r.status).toBe(200);
    expect(r.body.user.roles).toEqual(['abstractor']);
    expect(r.body.user.siteIds).toHaveLength(2);
    const me = await c.get('/api/auth/me');
    expect(me.body.user.email).toBe(demoEmail('abstractor'));
    const [row] = await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'sign-in' AND actor_email = $1`, [demoEmail('abstractor')]);
    expect(row.n).toBeGreaterThan(0);
  });

  it('when signed out, then the old cookie no longer works (V3.3.1)', async () => {
    const c = t.client();
    await c.signIn(demoEmail('analyst'));
    expect((await c.post('/api/auth/logout')).status).toBe(200);
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(401);
    expect(me.body.error.code).toBe('not_signed_in');
  });

  it('when the session id before sign-in is replayed, then it is not signed in (session fixation, V3.2.1)', async () => {
    const c = t.client();
    const pre = await c.agent.get('/api/auth/csrf');
    const preCookie = pre.headers['set-cookie'][0].split(';')[0];
    const login = await c.agent.post('/api/auth/login').set('x-csrf-token', pre.body.csrfToken).send({ email: demoEmail('committee'), password: 'tidewater-demo-2026' });
    expect(login.status).toBe(200);
    const postCookie = login.headers['set-cookie'][0].split(';')[0];
    expect(postCookie).not.toBe(preCookie);
    const replay = await t.client().agent.get('/api/auth/me').set('Cookie', preCookie);
    expect(replay.status).toBe(401);
  });

  it('when the cookie is set, then it is HttpOnly and SameSite=Strict (V3.4.2, V3.4.3)', async () => {
    const r = await t.client().agent.get('/api/auth/csrf');
    const cookie = r.headers['set-cookie'][0];
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
  });

  it('when the password is wrong, then the answer is 401 in the error envelope and the failure is audited', async () => {
    const c = t.client();
    const r = await c.signIn(demoEmail('researcher'), 'not the password at all');
    expect(r.status).toBe(401);
    expect(r.body.error).toMatchObject({ code: 'invalid_credentials', fields: [] });
    expect(r.body.error.hint).toBeTruthy();
  });
});

describe('lockout', () => {
  it('when five sign-ins fail, then the account is locked even for the right password (V2.2.1)', async () => {
    const email = 'lockout.person@tidewater.example';
    await newUser(email);
    const c = t.client();
    for (let i = 0; i < 4; i++) expect((await c.signIn(email, 'wrong password number x')).status).toBe(401);
    const fifth = await c.signIn(email, 'wrong password number x');
    expect(fifth.status).toBe(423);
    expect(fifth.body.error.code).toBe('account_locked');
    const right = await c.signIn(email, 'a quiet harbour at dawn');
    expect(right.status).toBe(423);
    const [row] = await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'lockout' AND actor_email = $1`, [email]);
    expect(row.n).toBe(1);
  });
});

describe('CSRF', () => {
  it('when a state-changing request has no token, then it is refused with 403 and nothing changes (V4.2.2)', async () => {
    const admin = await t.as('admin');
    const before = await t.ds.query(`SELECT count(*)::int AS n FROM sites`);
    const r = await admin.agent.post('/api/sites').send({ code: 'CSRF1', name: 'Should not exist' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('csrf_failed');
    const after = await t.ds.query(`SELECT count(*)::int AS n FROM sites`);
    expect(after[0].n).toBe(before[0].n);
  });

  it('when the token is from another session, then it is refused', async () => {
    const admin = await t.as('admin');
    const other = await t.client().refreshCsrf();
    const r = await admin.agent.post('/api/sites').set('x-csrf-token', other.csrf).send({ code: 'CSRF2', name: 'Should not exist' });
    expect(r.status).toBe(403);
  });
});

describe('password policy and reset by e-mail', () => {
  it('when a common or short password is chosen, then it is refused naming the field (V2.1.1, V2.1.7)', async () => {
    const email = 'policy.person@tidewater.example';
    const admin = await t.as('admin');
    await admin.post('/api/users', { email, displayName: 'Policy', roles: ['analyst'], siteIds: [] });
    const token = /token=([\w-]+)/.exec((await t.mailTo(email))[0].body)![1];
    const c = await t.client().refreshCsrf();
    const short = await c.post('/api/auth/invitation/accept', { token, password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields[0].path).toBe('password');
    // "password1234" is 12 characters and on common-password lists (from memory: it is in the shipped list).
    const common = await c.post('/api/auth/invitation/accept', { token, password: 'password1234' });
    expect(common.status).toBe(400);
    expect(common.body.error.code).toBe('weak_password');
  });

  it('when a reset is requested, then the e-mailed link sets a new password once and expires after use (V2.5.1, V2.5.2)', async () => {
    const email = 'reset.person@tidewater.example';
    await newUser(email);
    const c = await t.client().refreshCsrf();
    const req = await c.post('/api/auth/password-reset', { email });
    expect(req.status).toBe(202);
    const unknown = await c.post('/api/auth/password-reset', { email: 'nobody@tidewater.example' });
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(req.body);
    const mail = (await t.mailTo(email)).find((m) => /reset/i.test(m.subject))!;
    const token = /reset-password\?token=([\w-]+)/.exec(mail.body)![1];
    const ok = await c.post('/api/auth/password-reset/confirm', { token, password: 'lanterns along the quay' });
    expect(ok.status).toBe(200);
    const again = await c.post('/api/auth/password-reset/confirm', { token, password: 'another long passphrase' });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('token_invalid');
    expect((await t.client().signIn(email, 'lanterns along the quay')).status).toBe(200);
  });

  it('when a password is reset, then a session open elsewhere ends at once, though session rows are briefly reused (V3.3.3)', async () => {
    const email = 'other.session@tidewater.example';
    await newUser(email);
    const elsewhere = t.client();
    expect((await elsewhere.signIn(email, 'a quiet harbour at dawn')).status).toBe(200);
    // Two reads: the second is answered from the session cache (SESSION_USER_CACHE_MS).
    expect((await elsewhere.get('/api/auth/me')).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(200);
    const c = await t.client().refreshCsrf();
    await c.post('/api/auth/password-reset', { email });
    const mail = (await t.mailTo(email)).find((m) => /reset/i.test(m.subject))!;
    const token = /reset-password\?token=([\w-]+)/.exec(mail.body)![1];
    expect((await c.post('/api/auth/password-reset/confirm', { token, password: 'gulls over the breakwater' })).status).toBe(200);
    const after = await elsewhere.get('/api/auth/me');
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('not_signed_in');
  });

  it('when an admin deactivates a user, then that user\'s open session ends at once (V3.3.3)', async () => {
    const email = 'leaving.person@tidewater.example';
    const id = await newUser(email);
    const u = t.client();
    expect((await u.signIn(email, 'a quiet harbour at dawn')).status).toBe(200);
    expect((await u.get('/api/auth/me')).status).toBe(200);
    expect((await u.get('/api/auth/me')).status).toBe(200);
    const admin = await t.as('admin');
    expect((await admin.patch(`/api/users/${id}`, { active: false })).status).toBe(200);
    expect((await u.get('/api/auth/me')).status).toBe(401);
  });

  it('when the API answers, then it forbids caching and sends no ETag (V8.2.1)', async () => {
    const c = await t.as('analyst');
    for (const path of ['/api/auth/me', '/api/cases?pageSize=5', '/api/health']) {
      const r = await c.get(path);
      expect(r.status, path).toBe(200);
      expect(r.headers['cache-control'], path).toBe('no-store');
      expect(r.headers.etag, path).toBeUndefined();
    }
  });

  it('when a reset token is older than its hour, then it no longer works', async () => {
    const email = 'expired.person@tidewater.example';
    await newUser(email);
    const c = await t.client().refreshCsrf();
    await c.post('/api/auth/password-reset', { email });
    const mail = (await t.mailTo(email)).find((m) => /reset/i.test(m.subject))!;
    const token = /reset-password\?token=([\w-]+)/.exec(mail.body)![1];
    await t.ds.query(`UPDATE auth_tokens SET expires_at = now() - interval '1 minute' WHERE kind = 'reset' AND used_at IS NULL`);
    const r = await c.post('/api/auth/password-reset/confirm', { token, password: 'lanterns along the quay' });
    expect(r.status).toBe(400);
  });
});

describe('TOTP second factor', () => {
  it('when TOTP is enabled, then sign-in needs the current code (V2.8.1)', async () => {
    const email = 'totp.person@tidewater.example';
    await newUser(email);
    const c = t.client();
    await c.signIn(email, 'a quiet harbour at dawn');
    const setup = await c.post('/api/auth/totp/setup');
    expect(setup.status).toBe(200);
    const wrong = await c.post('/api/auth/totp/confirm', { code: '000000' === authenticator.generate(setup.body.secret) ? '111111' : '000000' });
    expect(wrong.status).toBe(400);
    const ok = await c.post('/api/auth/totp/confirm', { code: authenticator.generate(setup.body.secret) });
    expect(ok.status).toBe(200);
    const noCode = await t.client().signIn(email, 'a quiet harbour at dawn');
    expect(noCode.status).toBe(401);
    expect(noCode.body.error.code).toBe('totp_required');
    const withCode = await t.client().signIn(email, 'a quiet harbour at dawn', authenticator.generate(setup.body.secret));
    expect(withCode.status).toBe(200);
  });

  it('when an admin has no second factor outside demo mode, then only enrolment is allowed', async () => {
    const strict = await startTestApp({ DEMO_MODE: 'false' });
    try {
      const c = strict.client();
      const r = await c.signIn(demoEmail('admin'));
      expect(r.body.user.mustEnrollTotp).toBe(true);
      const users = await c.get('/api/users');
      expect(users.status).toBe(403);
      expect(users.body.error.code).toBe('totp_enrollment_required');
      expect((await c.post('/api/auth/totp/setup')).status).toBe(200);
    } finally {
      await strict.close();
    }
  });
});

describe('idle time-out', () => {
  it('when the session is idle longer than the setting, then it ends with a clear message (V3.3.2)', async () => {
    const short = await startTestApp({ IDLE_MINUTES: '0.02' });
    try {
      const c = short.client();
      await c.signIn(demoEmail('analyst'));
      expect((await c.get('/api/auth/me')).status).toBe(200);
      await new Promise((r) => setTimeout(r, 1600));
      const r = await c.get('/api/auth/me');
      expect(r.status).toBe(401);
    } finally {
      await short.close();
    }
  });
});

describe('audit table', () => {
  it('when the application role tries UPDATE or DELETE, then PostgreSQL refuses (V7.3.3)', async () => {
    // t.ds connects as the application's own role (DATABASE_URL), not the owner.
    const [{ current_user: who }] = await t.ds.query('SELECT current_user');
    expect(who).toBe(t.config.DATABASE_APP_ROLE);
    await expect(t.ds.query(`UPDATE audit_entries SET action = 'rewritten'`)).rejects.toThrow(/permission denied|append-only/);
    await expect(t.ds.query(`DELETE FROM audit_entries`)).rejects.toThrow(/permission denied|append-only/);
    await expect(t.ds.query(`TRUNCATE audit_entries`)).rejects.toThrow(/permission denied|append-only/);
    await t.ds.query(`INSERT INTO audit_entries (action) VALUES ('test-insert')`);
  });
});
