// `npm run backup`: a pg_dump of the `npm start` database into .data/backups (owner-only).
import path from 'node:path';
import { log, fail } from './lib.mjs';
import { prepareMain } from './main-env.mjs';
import { backupDatabase } from './backup-lib.mjs';

const { pg, env, startedHere } = prepareMain();
try {
  const file = backupDatabase({ pgBin: pg.bin, ownerUrl: env.DATABASE_OWNER_URL, dir: process.env.BACKUP_DIR ?? path.join(pg.dir, '..', 'backups') });
  log(`backup written to ${file} (mode 0600: it holds health data; keep it on protected storage)`);
} catch (e) {
  fail(e.message);
} finally {
  if (startedHere) pg.stop();
}
