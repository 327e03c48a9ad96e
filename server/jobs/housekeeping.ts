import { registerSchedule } from './registry.js';

// Sessions past their expiry are removed (connect-pg-simple prunes too; this covers a stopped pruner).
registerSchedule({
  name: 'expired-sessions',
  everyMs: 15 * 60_000,
  run: async ({ ds }) => {
    await ds.query(`DELETE FROM session WHERE expire < now()`);
  },
});
