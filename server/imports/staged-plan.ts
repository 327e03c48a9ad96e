/**
 * The dry run's plan, kept for the commit. Reading and validating a 50,000-row workbook again
 * took the commit as long as the dry run itself, so the dry run stores its plan (mapped fields
 * only, the hospital identifier already replaced by its keyed hash) beside the upload, with the
 * facts it was built on. The commit uses it only while those facts still hold: the same file,
 * mapping and decimal separator; the user's sites, the active sites and units and the therapy
 * settings unchanged; every existing case it touches still at the version it read; and no case
 * with one of its new identifier hashes written since. Otherwise the commit plans from the file
 * again, as before. The file lives and dies with the upload (storage.ts): owner-only, deleted at
 * commit, abandonment or retention.
 */
import fs from 'node:fs';
import v8 from 'node:v8';
import type { DataSource, EntityManager } from 'typeorm';
import type { TherapyCheckSettings } from '../../shared/clinical/modalities.js';
import type { Config } from '../config.js';
import type { Plan, PlanUser } from './plan.js';
import { planFilePath as planPath } from './storage.js';

type Db = DataSource | EntityManager;

/** What a plan was built on; compared field by field at commit. */
export interface PlanBasis {
  fileHash: string;
  mapping: string;
  decimal: string;
  /** Database clock when planning began. */
  startedAt: string;
  user: string;
  sites: string;
  therapySettings: string;
}

interface StagedFile { format: 1; basis: PlanBasis; plan: Plan }

/** Cases written this long before planning began still count as "written since" (long transactions). */
const CLOCK_MARGIN = `interval '10 minutes'`;

/** The columns of an import_jobs row a plan's basis reads. */
export interface ImportRow { id: string; file_hash: string; mapping: unknown; decimal: string }

/** The basis of a plan about to be built (or to check a stored one against). */
export async function planBasis(db: Db, r: ImportRow, user: PlanUser, settings: TherapyCheckSettings): Promise<PlanBasis> {
  const [clock] = await db.query(`SELECT clock_timestamp() AS t`);
  const [sites] = await db.query(
    `SELECT md5(coalesce(string_agg(concat_ws(':', s.id, s.code, u.id, u.code), ',' ORDER BY s.id, u.id), '')) AS fp
       FROM sites s LEFT JOIN units u ON u.site_id = s.id AND u.active WHERE s.active`,
  );
  return {
    fileHash: r.file_hash, mapping: JSON.stringify(r.mapping ?? null), decimal: r.decimal, startedAt: new Date(clock.t).toISOString(),
    user: JSON.stringify({ id: user.id, allSites: user.allSites, siteIds: [...user.siteIds].sort() }),
    sites: sites.fp, therapySettings: JSON.stringify(settings),
  };
}

/** Stores a clean plan for the commit (written to a temporary name, then renamed: never half a file). */
export async function saveStagedPlan(config: Pick<Config, 'DATA_DIR'>, importId: string, basis: PlanBasis, plan: Plan): Promise<void> {
  const target = planPath(config, importId);
  const tmp = `${target}.${process.pid}.tmp`;
  const body: StagedFile = { format: 1, basis, plan: { ...plan, problems: [] } };
  await fs.promises.writeFile(tmp, v8.serialize(body), { mode: 0o600 });
  await fs.promises.rename(tmp, target);
}

export async function discardStagedPlan(config: Pick<Config, 'DATA_DIR'>, importId: string): Promise<void> {
  await fs.promises.rm(planPath(config, importId), { force: true });
}

export type StagedPlanResult = { plan: Plan; reason?: undefined } | { plan: null; reason: string };

/** The stored plan if every fact it was built on still holds; else why not. */
export async function loadStagedPlan(db: Db, config: Pick<Config, 'DATA_DIR'>, r: ImportRow, user: PlanUser, settings: TherapyCheckSettings): Promise<StagedPlanResult> {
  let staged: StagedFile;
  try {
    staged = v8.deserialize(await fs.promises.readFile(planPath(config, r.id))) as StagedFile;
  } catch {
    return { plan: null, reason: 'no stored plan' };
  }
  if (staged?.format !== 1) return { plan: null, reason: 'stored plan of another format' };
  const now = await planBasis(db, r, user, settings);
  for (const k of ['fileHash', 'mapping', 'decimal', 'user', 'sites', 'therapySettings'] as const) {
    if (staged.basis[k] !== now[k]) return { plan: null, reason: `${k} changed since the dry run` };
  }
  const plan = staged.plan;
  const versions = new Map<string, number>();
  for (const c of plan.cases) if (c.existing) versions.set(c.existing.id, c.existing.version);
  for (const ch of [...plan.therapy, ...plan.outcomes]) if (ch.caseId && ch.caseVersion !== null) versions.set(ch.caseId, ch.caseVersion);
  const ids = [...versions.keys()];
  for (let i = 0; i < ids.length; i += 10_000) {
    const chunk = ids.slice(i, i + 10_000);
    const rows: { id: string; version: number }[] = await db.query(`SELECT id::text, version FROM surgical_cases WHERE id = ANY($1::uuid[])`, [chunk]);
    if (rows.length !== chunk.length || rows.some((x) => versions.get(x.id) !== x.version)) return { plan: null, reason: 'a case it updates or adds to was changed since the dry run' };
  }
  const hashes = [...new Set(plan.cases.filter((c) => !c.existing && c.identifierHash).map((c) => c.identifierHash!))];
  for (let i = 0; i < hashes.length; i += 10_000) {
    const [hit] = await db.query(
      `SELECT 1 FROM surgical_cases WHERE identifier_hash = ANY($1) AND updated_at > $2::timestamptz - ${CLOCK_MARGIN} LIMIT 1`,
      [hashes.slice(i, i + 10_000), staged.basis.startedAt],
    );
    if (hit) return { plan: null, reason: 'a case with one of its hospital identifiers was written since the dry run' };
  }
  return { plan };
}
