// `npm run restore FILE`: replaces the `npm start` database with a backup (stop the server first).
import { log, fail, runTs } from './lib.mjs';
import { prepareMain } from './main-env.mjs';
import { restoreDatabase } from './backup-lib.mjs';

const file = process.argv[2];
if (!file) fail('usage: npm run restore -- path/to/alveolog-....dump');
const { pg, env, startedHere } = prepareMain();
try {
  restoreDatabase({ pgBin: pg.bin, ownerUrl: env.DATABASE_OWNER_URL, superUrl: env.DATABASE_SUPER_URL, file });
  runTs('server/db/setup.ts', { ...env, SEED_DEMO: 'false' });
  log(`restored ${file}`);
} catch (e) {
  fail(e.message);
} finally {
  if (startedHere) pg.stop();
}
