// `npm start`: everything a fresh machine needs, then the app at http://127.0.0.1:3000 (PORT overrides).
// Node built-ins only until ensureNodeModules() has run.
import { log, fail, runTs, spawnTs, clientIsStale, buildClient } from './lib.mjs';
import { prepareMain } from './main-env.mjs';

const t0 = Date.now();
try {
  const { pg, env, startedHere, port } = prepareMain();
  runTs('server/db/setup.ts', env);
  if (clientIsStale()) buildClient();
  const server = spawnTs('server/main.ts', env);
  let stopping = false;
  const stop = (code) => {
    if (stopping) return;
    stopping = true;
    server.kill('SIGTERM');
    setTimeout(() => {
      if (startedHere) pg.stop();
      process.exit(code);
    }, 1500);
  };
  process.on('SIGINT', () => stop(0));
  process.on('SIGTERM', () => stop(0));
  server.on('exit', (code) => { if (!stopping) { log(`the server stopped (exit ${code})`); stop(code ?? 1); } });
  // Wait for the port before printing the welcome.
  const waitUp = async () => {
    for (let i = 0; i < 120; i++) {
      try {
        const r = await fetch(`http://127.0.0.1:${port}/api/health`);
        if (r.ok) return true;
      } catch { /* not yet */ }
      await new Promise((r) => setTimeout(r, 500));
    }
    return false;
  };
  if (await waitUp()) {
    const demo = env.DEMO_MODE === 'true';
    log(`ready in ${((Date.now() - t0) / 1000).toFixed(1)} s: open http://127.0.0.1:${port}`);
    if (demo) {
      const { register } = await import('tsx/esm/api');
      register();
      const { DEMO_USERS, DEMO_PASSWORD } = await import('../db/seed/scenario.ts');
      log(`demo sign-ins (password for all: ${DEMO_PASSWORD}):`);
      for (const u of DEMO_USERS) log(`  ${u.roles.join(', ').padEnd(11)} ${u.isChair ? '(chair) ' : ''}${u.email}`);
      log('demo mailbox (invitations, resets): sign in as admin, then Admin > Demo mailbox');
    }
    log('press Ctrl-C to stop the server and the PostgreSQL it started');
  } else {
    fail('the server did not answer within 60 s; see the messages above');
  }
} catch (err) {
  fail(err.message);
}
