import { createDataSource } from './create-data-source.js';

/** The DataSource the TypeORM CLI uses (as the owner role). */
export const dataSource = createDataSource(process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL ?? '');
