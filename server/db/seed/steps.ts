import type { DataSource } from 'typeorm';

/** Each area adds its demo data as a step, run in order after sites, units and users. */
export interface SeedStep { name: string; run: (ds: DataSource, log: (m: string) => void) => Promise<void> }
export const demoSeedSteps: SeedStep[] = [];
