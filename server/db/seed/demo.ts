import type { DataSource } from 'typeorm';
import { hashPassword } from '../../auth/passwords.js';
import { DEMO_PASSWORD, DEMO_USERS, NETWORK, SITES, UNITS } from './scenario.js';
import { demoSeedSteps } from './steps.js';
// Registers the demo cases step first: later areas' demo data builds on the cases.
import './cases.js';
import './committee.js';
import '../../quality/demo-seed.js';

/** Loads the demo scenario into an empty database (sites, units, users, then each area's step). */
export async function seedDemo(ds: DataSource, opts: { bcryptCost: number; log?: (m: string) => void }): Promise<void> {
  const log = opts.log ?? (() => undefined);
  const hash = await hashPassword(DEMO_PASSWORD, opts.bcryptCost);
  await ds.transaction(async (tx) => {
    await tx.query(`INSERT INTO settings (key, value) VALUES ('network', $1) ON CONFLICT (key) DO NOTHING`, [JSON.stringify(NETWORK)]);
    const siteIds: Record<string, string> = {};
    for (const s of SITES) {
      const [row] = await tx.query(`INSERT INTO sites (code, name, inclusion_criteria, exclusion_criteria) VALUES ($1, $2, $3, $4) RETURNING id`, [s.code, s.name, s.inclusion, s.exclusion]);
      siteIds[s.code] = row.id;
      for (const u of UNITS) await tx.query(`INSERT INTO units (site_id, code, name, kind) VALUES ($1, $2, $3, $4)`, [row.id, u.code, u.name, u.kind]);
    }
    for (const u of DEMO_USERS) {
      const [row] = await tx.query(`INSERT INTO users (email, display_name, password_hash, roles, is_chair) VALUES ($1, $2, $3, $4, $5) RETURNING id`, [u.email, u.displayName, hash, u.roles, u.isChair]);
      const codes = u.sites === 'all' ? SITES.map((s) => s.code) : u.sites;
      for (const c of codes) await tx.query(`INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)`, [row.id, siteIds[c]]);
    }
  });
  log('demo sites, units and users loaded');
  for (const step of demoSeedSteps) {
    const t = Date.now();
    await step.run(ds, log);
    log(`demo ${step.name} loaded in ${((Date.now() - t) / 1000).toFixed(1)} s`);
  }
  // After a bulk load: planner statistics for every table, and the visibility map that lets the
  // list indexes answer without visiting the heap (PostgreSQL manual, "Populating a Database").
  const t = Date.now();
  const [{ tables }] = await ds.query(`SELECT string_agg(format('%I', tablename), ', ') AS tables FROM pg_tables WHERE schemaname = 'public' AND tableowner = current_user`);
  if (tables) await ds.query(`VACUUM (ANALYZE) ${tables}`);
  log(`demo data vacuumed and analysed in ${((Date.now() - t) / 1000).toFixed(1)} s`);
}

export async function databaseIsEmpty(ds: DataSource): Promise<boolean> {
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM users`);
  return n === 0;
}
