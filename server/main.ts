import path from 'node:path';
import { loadConfig } from './config.js';
import { createDataSource } from './db/create-data-source.js';
import { createApp } from './app.js';
import { createMailer } from './mail/mailer.js';
import { startSmtpStandIn } from './mail/smtp-standin.js';
import { logger } from './logger.js';
import { startBackground } from './jobs/background.js';

/** Starts the server: connects, optionally the SMTP stand-in, background jobs, then listens. */
async function main() {
  const config = loadConfig();
  const ds = createDataSource(config.DATABASE_URL);
  await ds.initialize();
  const readDs = config.DATABASE_REPLICA_URL ? await createDataSource(config.DATABASE_REPLICA_URL).initialize() : ds;
  const smtp = config.SMTP_STANDIN ? await startSmtpStandIn(ds, config.SMTP_PORT) : null;
  const mailer = createMailer(config);
  const context = { ds, readDs, config, mailer };
  const app = createApp(context, { staticDir: path.resolve('dist') });
  const stopBackground = await startBackground(context);
  const server = app.listen(config.PORT, '127.0.0.1', () => {
    logger.info(`listening on http://127.0.0.1:${config.PORT}`);
    process.send?.('ready');
  });
  const shutdown = async () => {
    server.close();
    await stopBackground();
    await smtp?.close();
    mailer.close();
    await ds.destroy().catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGTERM', shutdown);
  process.on('SIGINT', shutdown);
}

main().catch((err) => {
  console.error(`[alveolog] the server could not start: ${err.message}`);
  process.exit(1);
});
