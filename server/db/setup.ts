import { migrate } from './migrate.js';
import { createDataSource } from './create-data-source.js';
import { databaseIsEmpty, seedDemo } from './seed/demo.js';

/**
 * The database step of `npm start` and `npm test`: migrate as the owner, then load the demo
 * scenario when the database is empty (and demo mode is on).
 */
async function setup() {
  const owner = process.env.DATABASE_OWNER_URL;
  if (!owner) throw new Error('DATABASE_OWNER_URL is not set');
  const t0 = Date.now();
  const ran = await migrate(owner, process.env.DATABASE_APP_ROLE ?? 'alveolog_app');
  console.log(`[alveolog] migrations: ${ran.length ? `${ran.length} applied` : 'up to date'} (${Date.now() - t0} ms)`);
  if (process.env.SEED_DEMO === 'true') {
    const ds = await createDataSource(owner, 4).initialize();
    try {
      if (await databaseIsEmpty(ds)) {
        console.log('[alveolog] loading the demo scenario (first start only) ...');
        await seedDemo(ds, { bcryptCost: Number(process.env.BCRYPT_COST ?? 12), log: (m) => console.log(`[alveolog] ${m}`) });
      }
    } finally {
      await ds.destroy();
    }
  }
}

setup().catch((e) => {
  console.error(`[alveolog] database set-up failed: ${e.message}`);
  process.exit(1);
});
