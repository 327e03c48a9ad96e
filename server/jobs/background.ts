import type { AppContext } from '../context.js';
import { logger } from '../logger.js';
import { failOrphanedJobs, runOne } from './jobs.service.js';
import { allSchedules } from './registry.js';
import './housekeeping.js';

/**
 * Starts the job runner and the schedules. One job at a time per server process: the machine
 * has two cores and PostgreSQL needs one.
 */
export async function startBackground(context: AppContext, opts: { pollMs?: number } = {}): Promise<() => Promise<void>> {
  const orphaned = await failOrphanedJobs(context.ds);
  if (orphaned) logger.warn(`${orphaned} job(s) were left running by a stopped server: marked failed and retryable`);
  let stopped = false;
  let current: Promise<unknown> = Promise.resolve();
  const poll = async () => {
    while (!stopped) {
      try {
        const ran = await runOne(context);
        if (!ran) await new Promise((r) => setTimeout(r, opts.pollMs ?? 500));
      } catch (err) {
        logger.warn({ err: (err as Error).message }, 'job runner could not poll');
        await new Promise((r) => setTimeout(r, 2000));
      }
    }
  };
  current = poll();
  const timers = allSchedules().map((s) =>
    setInterval(() => {
      s.run(context).catch((err) => logger.warn({ schedule: s.name, err: (err as Error).message }, 'scheduled task failed'));
    }, s.everyMs),
  );
  return async () => {
    stopped = true;
    timers.forEach(clearInterval);
    await current;
  };
}
