import { inject } from 'vitest';

let current: Record<string, string> | null = null;

/** The database this test file uses: its own clone (per-file-db.ts), else the run's database. */
export function testDbEnv(): Record<string, string> {
  return current ?? inject('testDbEnv');
}

export function setTestDbEnv(env: Record<string, string>): void {
  current = env;
}
