import { createHash, randomBytes } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { AppError } from '../http/errors.js';

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

/** Issues a single-use token (invite or reset); only its SHA-256 is stored (OWASP ASVS V2.5). */
export async function issueToken(db: DataSource | EntityManager, userId: string, kind: 'invite' | 'reset', hours: number): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  await db.query(`UPDATE auth_tokens SET used_at = now() WHERE user_id = $1 AND kind = $2 AND used_at IS NULL`, [userId, kind]);
  await db.query(`INSERT INTO auth_tokens (user_id, kind, token_hash, expires_at) VALUES ($1, $2, $3, now() + make_interval(mins => $4))`, [userId, kind, sha256(token), Math.round(hours * 60)]);
  return token;
}

/** Consumes a token atomically: a second use, an expired or an unknown token all fail the same way. */
export async function consumeToken(db: DataSource | EntityManager, token: string, kind: 'invite' | 'reset'): Promise<string> {
  const rows = await db.query(
    `UPDATE auth_tokens SET used_at = now() WHERE token_hash = $1 AND kind = $2 AND used_at IS NULL AND expires_at > now() RETURNING user_id`,
    [sha256(token), kind],
  );
  const list = Array.isArray(rows[0]) ? rows[0] : rows;
  if (!list.length) {
    throw new AppError(400, 'token_invalid', 'this link has expired or was already used', { hint: 'ask for a new link: links work once and for a limited time' });
  }
  return list[0].user_id as string;
}
