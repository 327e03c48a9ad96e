import type { TestProject } from 'vitest/node';
import { createTestDatabase, dropTestDatabase } from './test-cluster.js';

declare module 'vitest' {
  export interface ProvidedContext { testDbEnv: Record<string, string> }
}

/** One database per test run, cloned from the seeded template; dropped at the end. */
export default async function setup(project: TestProject) {
  const db = await createTestDatabase(project.name.replace(/\W/g, ''));
  project.provide('testDbEnv', db.env);
  Object.assign(process.env, db.env);
  return async () => {
    if (!process.env.KEEP_TEST_DB) await dropTestDatabase(db);
  };
}
