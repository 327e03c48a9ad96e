/** /api/cohorts: saved, named cohort filters (private or shared with the network). */
import { IdParamSchema } from '../../shared/sites.js';
import { SavedCohortCreateSchema, SavedCohortUpdateSchema } from '../../shared/analysis/cohorts.js';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { actor } from '../audit/audit.service.js';
import { ANALYSIS_ROLES } from '../analysis/analysis.router.js';
import { createCohort, deleteCohort, getCohort, listCohorts, updateCohort } from './cohorts.service.js';

const c = area('/api/cohorts');

const who = (req: Parameters<typeof actor>[0]) => {
  const a = actor(req);
  return { actorId: a.actorId ?? null, actorEmail: a.actorEmail ?? null, ip: a.ip ?? null };
};

c.get('/', ANALYSIS_ROLES, async (req) => listCohorts(ctx(req).ds, currentUser(req)));
c.post('/', ANALYSIS_ROLES, async (req, res) => {
  const body = parse(SavedCohortCreateSchema, req.body, 'cohort');
  const saved = await createCohort(ctx(req).ds, currentUser(req), body, who(req));
  res.status(201);
  return saved;
});
c.get('/:id', ANALYSIS_ROLES, async (req) => getCohort(ctx(req).ds, currentUser(req), parse(IdParamSchema, req.params, 'address').id));
c.patch('/:id', ANALYSIS_ROLES, async (req) => updateCohort(ctx(req).ds, currentUser(req), parse(IdParamSchema, req.params, 'address').id, parse(SavedCohortUpdateSchema, req.body, 'cohort'), who(req)));
c.delete('/:id', ANALYSIS_ROLES, async (req, res) => {
  await deleteCohort(ctx(req).ds, currentUser(req), parse(IdParamSchema, req.params, 'address').id, who(req));
  res.status(204).end();
});

export const cohortsRouter = c;
