// Fails when the entities and the committed migrations disagree (a forgotten migration).
import { createTestDatabase, dropTestDatabase } from './test-cluster.js';
import { createDataSource } from '../../server/db/create-data-source.js';

const db = await createTestDatabase('migcheck');
const ds = await createDataSource(db.env.DATABASE_OWNER_URL, 2).initialize();
try {
  const { upQueries } = await ds.driver.createSchemaBuilder().log();
  if (upQueries.length) {
    console.error('[alveolog] the entities need a migration that is not committed:');
    for (const q of upQueries) console.error(`  ${q.query}`);
    console.error('run: npm run migration:generate -- server/db/migrations/<Name>  (see DEVELOPERS.md)');
    process.exitCode = 1;
  } else {
    console.log('[alveolog] migrations match the entities');
  }
} finally {
  await ds.destroy();
  await dropTestDatabase(db);
}
