import { SMTPServer } from 'smtp-server';
import type { DataSource } from 'typeorm';
import { logger } from '../logger.js';

/**
 * A local stand-in SMTP server on 127.0.0.1 that stores every message it receives, so the demo
 * and the tests can read invitations and reset links. Never used in production.
 */
export async function startSmtpStandIn(ds: DataSource, port: number): Promise<{ port: number; close: () => Promise<void> }> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks).toString('utf8');
          const [head, ...rest] = raw.split(/\r?\n\r?\n/);
          const header = (name: string) => {
            const m = head.match(new RegExp(`^${name}:\\s*(.*(?:\\r?\\n[ \\t].*)*)`, 'im'));
            return m ? m[1].replace(/\r?\n[ \t]+/g, ' ').trim() : '';
          };
          let body = rest.join('\n\n');
          if (/quoted-printable/i.test(header('Content-Transfer-Encoding'))) {
            body = body.replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/g, (_, h) => String.fromCharCode(parseInt(h, 16)));
            body = Buffer.from(body, 'latin1').toString('utf8');
          }
          const to = session.envelope.rcptTo.map((r) => r.address);
          await ds.query('INSERT INTO mail_messages (mail_from, mail_to, subject, body) VALUES ($1, $2, $3, $4)', [
            session.envelope.mailFrom ? session.envelope.mailFrom.address : '', to, decodeSubject(header('Subject')), body,
          ]);
          callback();
        } catch (err) {
          logger.error({ err: (err as Error).message }, 'SMTP stand-in could not store a message');
          callback(err as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  return {
    port: typeof address === 'object' && address ? address.port : port,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

function decodeSubject(s: string): string {
  return s.replace(/=\?utf-8\?([BQ])\?([^?]*)\?=/gi, (_, enc: string, text: string) =>
    enc.toUpperCase() === 'B' ? Buffer.from(text, 'base64').toString('utf8') : text.replace(/_/g, ' ').replace(/=([0-9A-F]{2})/gi, (_m, h) => String.fromCharCode(parseInt(h, 16))),
  );
}
