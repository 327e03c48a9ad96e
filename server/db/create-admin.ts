import { createDataSource } from './create-data-source.js';
import { EmailSchema } from '../../shared/auth/user.js';
import { issueToken } from '../auth/tokens.js';
import { audit } from '../audit/audit.service.js';

/** Creates an administrator without a password and prints a one-time link to choose one. */
async function main() {
  const [emailArg, name] = process.argv.slice(2);
  const email = EmailSchema.parse(emailArg);
  const ds = await createDataSource(process.env.DATABASE_URL!, 2).initialize();
  try {
    const existing = await ds.query(`SELECT id FROM users WHERE email = $1`, [email]);
    const id: string = existing[0]?.id ?? (await ds.query(`INSERT INTO users (email, display_name, roles) VALUES ($1, $2, '{admin}') RETURNING id`, [email, name]))[0].id;
    await ds.query(`UPDATE users SET roles = (SELECT array_agg(DISTINCT r) FROM unnest(roles || '{admin}'::text[]) r), active = true WHERE id = $1`, [id]);
    const token = await issueToken(ds, id, existing[0] ? 'reset' : 'invite', 72);
    await audit(ds, { action: 'admin-created-by-command', entity: 'user', entityId: id, newValue: { email } });
    const url = `${process.env.APP_URL}/${existing[0] ? 'reset-password' : 'accept-invitation'}?token=${token}`;
    console.log(`[alveolog] administrator ${email} is ready. Open this link within 72 hours to choose the password (it works once):\n  ${url}\nThen set up two-step sign-in when asked (required for administrators outside demo mode).`);
  } finally {
    await ds.destroy();
  }
}
main().catch((e) => { console.error(`[alveolog] ${e.message}`); process.exit(1); });
