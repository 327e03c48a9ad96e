// Backup and restore with PostgreSQL's own pg_dump / pg_restore (Debian's packages).
import fs from 'node:fs';
import path from 'node:path';
import { run } from './lib.mjs';

function parseUrl(url) {
  const u = new URL(url);
  return { host: u.hostname, port: u.port, user: decodeURIComponent(u.username), password: decodeURIComponent(u.password), database: u.pathname.slice(1) };
}

/**
 * Writes a custom-format dump of the database. The file holds health data, so it is created
 * owner-only (0600) in an owner-only folder.
 */
export function backupDatabase({ pgBin, ownerUrl, dir }) {
  const c = parseUrl(ownerUrl);
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  fs.chmodSync(dir, 0o700);
  const stamp = new Date().toISOString().replace(/[:.]/g, '-');
  const file = path.join(dir, `alveolog-${c.database}-${stamp}.dump`);
  const fd = fs.openSync(file, 'wx', 0o600);
  fs.closeSync(fd);
  run(path.join(pgBin, 'pg_dump'), ['-h', c.host, '-p', c.port, '-U', c.user, '-d', c.database, '-Fc', '--no-privileges', '-f', file], {
    quiet: true, env: { ...process.env, PGPASSWORD: c.password },
  });
  fs.chmodSync(file, 0o600);
  return file;
}

/**
 * Restores a dump into a fresh database of the same name (the old one is dropped, so stop the
 * server first), owned by the owner role; grants for the application role are re-applied by the
 * migration step that follows.
 */
export function restoreDatabase({ pgBin, ownerUrl, superUrl, file }) {
  if (!fs.existsSync(file)) throw new Error(`no backup file at ${file}`);
  const c = parseUrl(ownerUrl);
  const s = parseUrl(superUrl);
  const psql = (sql) => run(path.join(pgBin, 'psql'), ['-h', s.host, '-p', s.port, '-U', s.user, '-d', 'postgres', '-v', 'ON_ERROR_STOP=1', '-qAt', '-c', sql], { quiet: true, env: { ...process.env, PGPASSWORD: s.password } });
  psql(`DROP DATABASE IF EXISTS "${c.database}" WITH (FORCE)`);
  psql(`CREATE DATABASE "${c.database}" OWNER "${c.user}"`);
  run(path.join(pgBin, 'pg_restore'), ['-h', c.host, '-p', c.port, '-U', c.user, '-d', c.database, '--no-owner', '--exit-on-error', '--single-transaction', file], {
    quiet: true, env: { ...process.env, PGPASSWORD: c.password },
  });
}
