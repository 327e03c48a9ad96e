import type { Request } from 'express';
import type passport from 'passport';
import { authenticator } from 'otplib';
import { area, currentUser, parse } from '../http/route.js';
import { AppError } from '../http/errors.js';
import { ctx } from '../context.js';
import { audit, actor } from '../audit/audit.service.js';
import { LoginSchema, PasswordResetConfirmSchema, PasswordResetRequestSchema, TotpConfirmSchema, type MeResponse, type SessionUser } from '../../shared/auth/user.js';
import { generateToken } from './csrf.js';
import { assertPasswordPolicy, hashPassword } from './passwords.js';
import { consumeToken, issueToken } from './tokens.js';
import { forgetSessionUser, loadSessionUser } from './session-user.js';
import { appUrl } from '../http/app-url.js';

const a = area('/api/auth');

function me(req: Request, user: SessionUser, freshToken = false): MeResponse {
  const { config } = ctx(req);
  return { user, csrfToken: generateToken(req, freshToken), demoMode: config.DEMO_MODE, idleMinutes: config.IDLE_MINUTES };
}

/** A fresh CSRF token for the sign-in form (the session exists from here on). */
a.get('/csrf', 'public', (req) => ({ csrfToken: generateToken(req) }));

a.post('/login', 'public', async (req, res) => {
  parse(LoginSchema, req.body, 'sign-in form');
  const user = await new Promise<SessionUser>((resolve, reject) => {
    (req.app.locals.passport as passport.PassportStatic).authenticate('local', (err: unknown, u: SessionUser | false) => {
      if (err) return reject(err);
      if (!u) return reject(new AppError(401, 'invalid_credentials', 'the e-mail or password is not right', { hint: 'check both and try again' }));
      resolve(u);
    })(req, res, () => undefined);
  });
  // passport 0.7 regenerates the session id on login (session fixation, OWASP ASVS V3.2.1).
  await new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
  (req.session as unknown as { lastSeen: number }).lastSeen = Date.now();
  await audit(ctx(req).ds, { action: 'sign-in', actorId: user.id, actorEmail: user.email, ip: req.ip ?? null });
  return me(req, user, true);
});

a.post('/logout', 'signed-in', async (req, res) => {
  const user = currentUser(req);
  await audit(ctx(req).ds, { action: 'sign-out', ...actor(req) });
  await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
  await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
  res.clearCookie('alveolog.sid');
  return { signedOut: user.email };
});

a.get('/me', 'signed-in', (req) => me(req, currentUser(req)));

/** Always answers the same way, whether or not the address has an account (no account enumeration). */
a.post('/password-reset', 'public', async (req, res) => {
  const { email } = parse(PasswordResetRequestSchema, req.body, 'password reset request');
  const { ds, mailer } = ctx(req);
  const rows = await ds.query(`SELECT id FROM users WHERE email = $1 AND active`, [email]);
  if (rows[0]) {
    const token = await issueToken(ds, rows[0].id, 'reset', 1);
    await audit(ds, { action: 'password-reset-requested', actorEmail: email, entity: 'user', entityId: rows[0].id, ip: req.ip ?? null });
    await mailer.send({
      to: email,
      subject: 'Alveolog: reset your password',
      text: `Someone asked to reset the password of your Alveolog account.\n\nOpen this link within 1 hour to choose a new password (it works once):\n${appUrl(req)}/reset-password?token=${token}\n\nIf it was not you, ignore this message.`,
    });
  }
  res.status(202);
  return { accepted: true, message: 'if the address has an account, a reset link is on its way' };
});

async function setPasswordFromToken(req: Request, kind: 'invite' | 'reset') {
  const { token, password } = parse(PasswordResetConfirmSchema, req.body, kind === 'invite' ? 'invitation form' : 'password reset form');
  const { ds, config } = ctx(req);
  const { userId, email } = await ds.transaction(async (tx) => {
    const userId = await consumeToken(tx, token, kind);
    const [u] = await tx.query(`SELECT email FROM users WHERE id = $1`, [userId]);
    assertPasswordPolicy(password, u.email);
    await tx.query(`UPDATE users SET password_hash = $2, failed_attempts = 0, locked_until = NULL WHERE id = $1`, [userId, await hashPassword(password, config.BCRYPT_COST)]);
    // A password change ends every other session of that user (OWASP ASVS V3.3.3).
    await tx.query(`DELETE FROM session WHERE sess->'passport'->>'user' = $1`, [userId]);
    await audit(tx, { action: kind === 'invite' ? 'invitation-accepted' : 'password-reset', actorId: userId, actorEmail: u.email, entity: 'user', entityId: userId, ip: req.ip ?? null });
    return { userId, email: u.email as string };
  });
  // After the commit: this process stops reusing the sessions the transaction deleted.
  forgetSessionUser(ds, userId);
  return { ok: true, email };
}

a.post('/password-reset/confirm', 'public', (req) => setPasswordFromToken(req, 'reset'));
a.post('/invitation/accept', 'public', (req) => setPasswordFromToken(req, 'invite'));

/** Starts TOTP enrolment: a new secret, not active until a code from it is confirmed. */
a.post('/totp/setup', 'signed-in', async (req) => {
  const user = currentUser(req);
  const { ds } = ctx(req);
  const secret = authenticator.generateSecret();
  await ds.query(`UPDATE users SET totp_secret = $2, totp_enabled = false WHERE id = $1`, [user.id, secret]);
  forgetSessionUser(ds, user.id);
  return { secret, otpauthUrl: authenticator.keyuri(user.email, 'Alveolog', secret) };
});

a.post('/totp/confirm', 'signed-in', async (req) => {
  const user = currentUser(req);
  const { code } = parse(TotpConfirmSchema, req.body, 'second-factor code');
  const { ds, config } = ctx(req);
  const [row] = await ds.query(`SELECT totp_secret FROM users WHERE id = $1`, [user.id]);
  if (!row?.totp_secret) throw new AppError(400, 'totp_not_started', 'start the set-up first', { hint: 'press "Set up two-step sign-in" to get a new secret' });
  if (!authenticator.check(code, row.totp_secret)) {
    throw new AppError(400, 'totp_wrong_code', 'that code does not match', { hint: 'check the time on your phone and type the code shown now', fields: [{ path: 'code', message: 'does not match' }] });
  }
  await ds.query(`UPDATE users SET totp_enabled = true WHERE id = $1`, [user.id]);
  forgetSessionUser(ds, user.id);
  await audit(ds, { action: 'totp-enabled', ...actor(req), entity: 'user', entityId: user.id });
  const fresh = await loadSessionUser(ds, user.id, config.DEMO_MODE);
  return me(req, fresh!);
});

export const authRouter = a;
