/**
 * Where uploaded files wait between upload and commit (DATA_DIR/imports), and their deletion:
 * a file is kept only until its import is committed or abandoned, or for UPLOAD_RETENTION_HOURS.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { DataSource } from 'typeorm';
import type { Config } from '../config.js';
import { logger } from '../logger.js';

/** The dry run's stored plan of an import (staged-plan.ts), kept beside its upload. */
export const planFileName = (importId: string) => `${path.basename(importId)}.plan`;
export const planFilePath = (config: Pick<Config, 'DATA_DIR'>, importId: string) => path.join(uploadDir(config), planFileName(importId));

export function uploadDir(config: Pick<Config, 'DATA_DIR'>): string {
  const dir = path.resolve(config.DATA_DIR, 'imports');
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  return dir;
}

/** Deletes an import's file (if still there) and records when. */
export async function deleteImportFile(ds: DataSource, config: Pick<Config, 'DATA_DIR'>, importId: string): Promise<void> {
  const [row] = await ds.query(`SELECT stored_path FROM import_jobs WHERE id = $1`, [importId]);
  if (row?.stored_path) {
    const full = path.resolve(uploadDir(config), path.basename(row.stored_path));
    await fs.promises.rm(full, { force: true });
  }
  // The dry run's stored plan (staged-plan.ts) goes with its upload.
  await fs.promises.rm(planFilePath(config, importId), { force: true });
  await ds.query(`UPDATE import_jobs SET stored_path = NULL, file_deleted_at = COALESCE(file_deleted_at, now()) WHERE id = $1`, [importId]);
}

export function storedFile(config: Pick<Config, 'DATA_DIR'>, storedPath: string | null): string | null {
  if (!storedPath) return null;
  const full = path.resolve(uploadDir(config), path.basename(storedPath));
  return fs.existsSync(full) ? full : null;
}

/**
 * Retention: uploads older than UPLOAD_RETENTION_HOURS that were not committed are abandoned and
 * their files deleted; stray files in the folder (a crash between upload and record) go too.
 */
export async function purgeExpiredUploads(ds: DataSource, config: Pick<Config, 'DATA_DIR' | 'UPLOAD_RETENTION_HOURS'>): Promise<number> {
  const rows: { id: string }[] = await ds.query(
    `SELECT id FROM import_jobs WHERE stored_path IS NOT NULL AND status NOT IN ('committing', 'validating') AND created_at < now() - ($1::float8 * interval '1 hour')`,
    [config.UPLOAD_RETENTION_HOURS],
  );
  for (const r of rows) {
    await ds.query(`UPDATE import_jobs SET status = CASE WHEN status = 'committed' THEN status ELSE 'abandoned' END, abandoned_at = CASE WHEN status = 'committed' THEN abandoned_at ELSE now() END WHERE id = $1`, [r.id]);
    await deleteImportFile(ds, config, r.id);
  }
  const dir = uploadDir(config);
  const kept: { id: string; stored_path: string }[] = await ds.query(`SELECT id, stored_path FROM import_jobs WHERE stored_path IS NOT NULL`);
  const known = new Set(kept.flatMap((r) => [path.basename(r.stored_path), planFileName(r.id)]));
  // A file with no record (or a plan whose upload is gone) is an upload in flight or left by a
  // crash: gone after ten minutes.
  const cutoff = Date.now() - 10 * 60_000;
  for (const name of await fs.promises.readdir(dir)) {
    if (known.has(name)) continue;
    const full = path.join(dir, name);
    const st = await fs.promises.stat(full).catch(() => null);
    if (st && st.mtimeMs < cutoff) await fs.promises.rm(full, { force: true });
  }
  if (rows.length) logger.info({ count: rows.length }, 'expired import uploads deleted');
  return rows.length;
}
