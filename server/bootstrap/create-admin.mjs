// `npm run create-admin -- EMAIL "Display name"`: the first administrator outside demo mode.
// No default password: it prints a one-time invitation link (72 hours) to choose one.
import { fail, runTs } from './lib.mjs';
import { prepareMain } from './main-env.mjs';

const [email, name] = process.argv.slice(2);
if (!email || !name) fail('usage: npm run create-admin -- admin@your-hospital.org "Display name"');
const { pg, env, startedHere } = prepareMain();
try {
  runTs('server/db/setup.ts', { ...env, SEED_DEMO: 'false' });
  runTs('server/db/create-admin.ts', env, [email, name]);
} finally {
  if (startedHere) pg.stop();
}
