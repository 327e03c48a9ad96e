import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { authenticator } from 'otplib';
import type { AppContext } from '../context.js';
import { audit } from '../audit/audit.service.js';
import { cachedSessionUser, loadSessionUser } from './session-user.js';
import { verifyPassword } from './passwords.js';
import { AppError } from '../http/errors.js';

// One TOTP step of drift either side (RFC 6238 section 5.2 recommends allowing for it).
authenticator.options = { window: 1 };

const invalid = () => new AppError(401, 'invalid_credentials', 'the e-mail or password is not right', { hint: 'check both and try again; after repeated failures the account is locked for a while' });

/**
 * Sign-in with passport-local: bcrypt check, temporary lockout after repeated failures,
 * TOTP when the account has it, every outcome in the audit table.
 */
export function configurePassport(app: AppContext): passport.PassportStatic {
  const { ds, config } = app;
  // One Passport instance per app (tests build several apps with different settings).
  const instance = new passport.Passport() as passport.PassportStatic;
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', passReqToCallback: true }, async (req, email, password, done) => {
      try {
        const ip = req.ip ?? null;
        const rows = await ds.query(`SELECT id, email, password_hash, active, totp_enabled, totp_secret, failed_attempts, locked_until FROM users WHERE email = $1`, [email.trim().toLowerCase()]);
        const u = rows[0];
        if (!u || !u.active || !u.password_hash) {
          await audit(ds, { action: 'sign-in-failed', actorEmail: email.slice(0, 200), ip, details: { reason: 'unknown or inactive account' } });
          return done(invalid());
        }
        if (u.locked_until && new Date(u.locked_until) > new Date()) {
          await audit(ds, { action: 'sign-in-refused-locked', actorId: u.id, actorEmail: u.email, ip });
          const until = new Date(u.locked_until);
          return done(new AppError(423, 'account_locked', `too many failed sign-ins: this account is locked until ${until.toISOString().slice(11, 16)} UTC`, {
            hint: `wait ${config.LOCKOUT_MINUTES} minutes or ask an administrator to send a password reset`,
            details: { lockedUntil: until.toISOString() },
          }));
        }
        let ok = await verifyPassword(password, u.password_hash);
        let reason = 'wrong password';
        if (ok && u.totp_enabled) {
          const code = typeof req.body?.totp === 'string' ? req.body.totp : '';
          if (!code) return done(new AppError(401, 'totp_required', 'enter the 6-digit code from your authenticator app', { hint: 'open the app you set up for Alveolog and type the current code', fields: [{ path: 'totp', message: 'required' }] }));
          ok = authenticator.check(code, u.totp_secret);
          reason = 'wrong second-factor code';
        }
        if (!ok) {
          const failures = u.failed_attempts + 1;
          const lock = failures >= config.LOGIN_MAX_FAILURES;
          await ds.query(`UPDATE users SET failed_attempts = $2, locked_until = CASE WHEN $3 THEN now() + make_interval(mins => $4) ELSE locked_until END WHERE id = $1`, [u.id, lock ? 0 : failures, lock, config.LOCKOUT_MINUTES]);
          await audit(ds, { action: 'sign-in-failed', actorId: u.id, actorEmail: u.email, ip, details: { reason, failures } });
          if (lock) {
            await audit(ds, { action: 'lockout', actorId: u.id, actorEmail: u.email, ip, details: { minutes: config.LOCKOUT_MINUTES } });
            return done(new AppError(423, 'account_locked', `too many failed sign-ins: this account is now locked for ${config.LOCKOUT_MINUTES} minutes`, { hint: 'wait, or ask an administrator to send a password reset' }));
          }
          return done(invalid());
        }
        await ds.query(`UPDATE users SET failed_attempts = 0, locked_until = NULL, last_login_at = now() WHERE id = $1`, [u.id]);
        const user = await loadSessionUser(ds, u.id, config.DEMO_MODE);
        return done(null, user ?? false);
      } catch (err) {
        return done(err);
      }
    }),
  );
  instance.serializeUser((user, done) => done(null, (user as { id: string }).id));
  instance.deserializeUser(async (id: string, done) => {
    try {
      done(null, (await cachedSessionUser(ds, id, config.DEMO_MODE, config.SESSION_USER_CACHE_MS)) ?? false);
    } catch (err) {
      done(err);
    }
  });
  return instance;
}
