import { createDataSource } from './create-data-source.js';

/**
 * Runs pending migrations as the owner role, then grants the application's role what it needs:
 * read and write on every table, but only INSERT and SELECT on the audit table.
 */
export async function migrate(ownerUrl: string, appRole: string): Promise<string[]> {
  if (!/^[a-z_][a-z0-9_]*$/.test(appRole)) throw new Error(`unsafe role name ${appRole}`);
  const ds = createDataSource(ownerUrl, 2);
  await ds.initialize();
  try {
    const ran = await ds.runMigrations({ transaction: 'each' });
    await ds.query(`GRANT USAGE ON SCHEMA public TO ${appRole}`);
    await ds.query(`GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${appRole}`);
    await ds.query(`GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${appRole}`);
    await ds.query(`REVOKE UPDATE, DELETE, TRUNCATE ON audit_entries FROM ${appRole}`);
    await ds.query(`REVOKE ALL ON migrations FROM ${appRole}`);
    await ds.query(`GRANT SELECT ON migrations TO ${appRole}`);
    return ran.map((m) => m.name);
  } finally {
    await ds.destroy();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const owner = process.env.DATABASE_OWNER_URL;
  if (!owner) throw new Error('DATABASE_OWNER_URL is not set');
  migrate(owner, process.env.DATABASE_APP_ROLE ?? 'alveolog_app')
    .then((ran) => console.log(`[alveolog] migrations: ${ran.length ? ran.join(', ') : 'up to date'}`))
    .catch((e) => { console.error(`[alveolog] migration failed: ${e.message}`); process.exit(1); });
}
