import { testDbEnv } from '../setup/db-env.js';
import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../../server/config.js';
import { createDataSource } from '../../server/db/create-data-source.js';
import { createApp } from '../../server/app.js';
import { createMailer } from '../../server/mail/mailer.js';
import { startSmtpStandIn } from '../../server/mail/smtp-standin.js';
import type { DataSource } from 'typeorm';
import type { AppContext } from '../../server/context.js';
import { DEMO_PASSWORD, DEMO_USERS } from '../../server/db/seed/scenario.js';
import type { Role } from '../../shared/auth/roles.js';

export type DemoKey = 'admin' | 'abstractor' | 'abstractor2' | 'analyst' | 'chair' | 'committee' | 'researcher';
export const demoEmail = (key: DemoKey) => `${key}@tidewater.example`;
export const demoUser = (key: DemoKey) => DEMO_USERS.find((u) => u.email === demoEmail(key))!;
/** A demo user per role (the chair is the committee role's first member). */
export const ROLE_USER: Record<Role, DemoKey> = { admin: 'admin', abstractor: 'abstractor', analyst: 'analyst', committee: 'committee', researcher: 'researcher' };

/** A supertest agent that keeps its cookie and sends the CSRF token on every request. */
export class Client {
  csrf = '';
  constructor(readonly agent: ReturnType<typeof request.agent>) {}
  async refreshCsrf() {
    const r = await this.agent.get('/api/auth/csrf');
    this.csrf = r.body.csrfToken;
    return this;
  }
  get(url: string) { return this.agent.get(url); }
  post(url: string, body?: unknown) { return this.agent.post(url).set('x-csrf-token', this.csrf).send(body as object); }
  put(url: string, body?: unknown) { return this.agent.put(url).set('x-csrf-token', this.csrf).send(body as object); }
  patch(url: string, body?: unknown) { return this.agent.patch(url).set('x-csrf-token', this.csrf).send(body as object); }
  delete(url: string) { return this.agent.delete(url).set('x-csrf-token', this.csrf); }
  async signIn(email: string, password = DEMO_PASSWORD, totp?: string) {
    await this.refreshCsrf();
    const r = await this.agent.post('/api/auth/login').set('x-csrf-token', this.csrf).send({ email, password, totp });
    if (r.body?.csrfToken) this.csrf = r.body.csrfToken;
    return r;
  }
}

export interface TestApp {
  app: Express;
  ds: DataSource;
  config: Config;
  context: AppContext;
  client(): Client;
  as(key: DemoKey): Promise<Client>;
  /** Messages the SMTP stand-in received for an address, newest first. */
  mailTo(email: string): Promise<{ subject: string; body: string }[]>;
  close(): Promise<void>;
}

/** Builds the app in-process on this run's database (a clone of the seeded template). */
export async function startTestApp(overrides: Record<string, string> = {}, opts: { staticDir?: string } = {}): Promise<TestApp> {
  const env = { ...testDbEnv(), ...overrides };
  const smtpDs = await createDataSource(env.DATABASE_URL, 2).initialize();
  const smtp = await startSmtpStandIn(smtpDs, 0);
  const config = loadConfig({ ...env, SMTP_STANDIN: 'true', SMTP_PORT: String(smtp.port) } as NodeJS.ProcessEnv);
  const ds = await createDataSource(config.DATABASE_URL, 5).initialize();
  const mailer = createMailer(config);
  const context: AppContext = { ds, readDs: ds, config, mailer };
  const app = createApp(context, { staticDir: opts.staticDir });
  const signedIn = new Map<DemoKey, Client>();
  return {
    app, ds, config, context,
    client: () => new Client(request.agent(app)),
    async as(key) {
      const existing = signedIn.get(key);
      if (existing) return existing;
      const c = new Client(request.agent(app));
      const r = await c.signIn(demoEmail(key));
      if (r.status !== 200) throw new Error(`demo sign-in for ${key} failed: ${r.status} ${JSON.stringify(r.body)}`);
      signedIn.set(key, c);
      return c;
    },
    async mailTo(email) {
      // Delivery is asynchronous: give the stand-in a moment to store the message.
      for (let i = 0; i < 20; i++) {
        const rows = await ds.query(`SELECT subject, body FROM mail_messages WHERE $1 = ANY(mail_to) ORDER BY received_at DESC`, [email]);
        if (rows.length) return rows;
        await new Promise((r) => setTimeout(r, 100));
      }
      return [];
    },
    async close() {
      mailer.close();
      await smtp.close();
      await (app.locals.sessionPool as { end(): Promise<void> }).end();
      await ds.destroy();
      await smtpDs.destroy();
    },
  };
}
