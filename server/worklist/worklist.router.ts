/** GET /api/worklist: cases of the user's sites needing data, follow-up or verification. */
import { area, currentUser } from '../http/route.js';
import { ctx } from '../context.js';
import { WorklistQuerySchema } from '../../shared/registry/worklist.js';
import { parseBody } from '../registry/validation.js';
import { today } from '../cases/case.service.js';
import { buildWorklist } from './worklist.service.js';

const a = area('/api/worklist');

a.get('/', ['admin', 'abstractor', 'analyst'], async (req) => {
  const { ds, config } = ctx(req);
  return buildWorklist({ ds, today: today(config), timeZone: config.NETWORK_TIME_ZONE, verifyWaitDays: config.VERIFY_WAIT_DAYS }, currentUser(req), parseBody(WorklistQuerySchema, req.query, 'worklist filter'));
});

export const worklistRouter = a;
