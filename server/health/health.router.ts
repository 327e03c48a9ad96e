import { area } from '../http/route.js';
import { ctx } from '../context.js';

const a = area('/api/health');

/** Liveness and database reachability; 503 while PostgreSQL is down (the pool reconnects by itself). */
a.get('/', 'public', async (req, res) => {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      ctx(req).ds.query('SELECT 1'),
      new Promise((_, reject) => { timer = setTimeout(() => reject(new Error('timeout')), 2000); }),
    ]);
    return { status: 'ok', database: 'ok' };
  } catch {
    res.status(503);
    return { status: 'degraded', database: 'unavailable' };
  } finally {
    clearTimeout(timer);
  }
});

export const healthRouter = a;
