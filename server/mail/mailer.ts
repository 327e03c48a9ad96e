import nodemailer from 'nodemailer';
import type { Config } from '../config.js';
import { logger } from '../logger.js';

export interface Mail { to: string | string[]; subject: string; text: string }
export interface Mailer { send(mail: Mail): Promise<void>; close(): void }

/** Sends through SMTP: the local stand-in in demo and tests, a real host in production. */
export function createMailer(config: Config): Mailer {
  const transport = nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE,
    ignoreTLS: config.SMTP_STANDIN,
    auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASSWORD ?? '' } : undefined,
  });
  return {
    async send(mail) {
      try {
        await transport.sendMail({ from: config.MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text });
      } catch (err) {
        // A mail failure must not undo the work that caused it; it is logged for the administrator.
        logger.error({ err: (err as Error).message, subject: mail.subject }, 'mail could not be sent');
      }
    },
    close() {
      transport.close();
    },
  };
}
