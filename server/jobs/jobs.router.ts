import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { IdParamSchema } from '../../shared/sites.js';
import { notFound, AppError } from '../http/errors.js';
import { getJob, requestCancel, retryJob } from './jobs.service.js';

const a = area('/api/jobs');

async function ownJob(req: Parameters<typeof ctx>[0]) {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const user = currentUser(req);
  const job = await getJob(ctx(req).ds, id);
  // Only the job's creator or an admin sees it; others get 404 (existence not revealed).
  if (!job || (job.createdBy !== user.id && !user.roles.includes('admin'))) throw notFound('the job');
  return job;
}

a.get('/:id', 'signed-in', (req) => ownJob(req));

a.post('/:id/cancel', 'signed-in', async (req) => {
  const job = await ownJob(req);
  await requestCancel(ctx(req).ds, job.id);
  return getJob(ctx(req).ds, job.id);
});

a.post('/:id/retry', 'signed-in', async (req) => {
  const job = await ownJob(req);
  if (!(await retryJob(ctx(req).ds, job.id))) throw new AppError(409, 'not_retryable', 'only a failed or cancelled job can be retried', { hint: 'wait for the job to finish' });
  return getJob(ctx(req).ds, job.id);
});

export const jobsRouter = a;
