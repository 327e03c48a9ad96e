import { area } from '../http/route.js';
import { ctx } from '../context.js';
import { notFound } from '../http/errors.js';

const a = area('/api/mail');

/** The stand-in mailbox: exists only in demo mode, for administrators. */
a.get('/', ['admin'], async (req) => {
  const { ds, config } = ctx(req);
  if (!config.DEMO_MODE) throw notFound('the demo mailbox');
  const rows = await ds.query(`SELECT id, received_at, mail_from, mail_to, subject, body FROM mail_messages ORDER BY received_at DESC LIMIT 200`);
  return { items: rows.map((r: any) => ({ id: r.id, receivedAt: new Date(r.received_at).toISOString(), from: r.mail_from, to: r.mail_to, subject: r.subject, body: r.body })) };
});

export const mailRouter = a;
