/** /api/cases/:id/therapy: the case's lung-expansion therapy episodes (same roles as the case). */
import type { Request } from 'express';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { IdParamSchema } from '../../shared/sites.js';
import { RecordRemoveSchema, TherapyEpisodeCreateSchema, TherapyEpisodeUpdateSchema } from '../../shared/registry/therapy.js';
import { parseBody } from '../registry/validation.js';
import { CASE_EDITORS, CASE_READERS, actorOf } from '../cases/cases.router.js';
import { getCaseView } from '../cases/case.service.js';
import { addEpisode, removeEpisode, updateEpisode } from './therapy.service.js';

const a = area('/api/cases');
const services = (req: Request) => ({ ds: ctx(req).ds, config: ctx(req).config });
const ids = (req: Request) => ({
  caseId: parse(IdParamSchema, { id: req.params.id }, 'address').id,
  episodeId: req.params.episodeId === undefined ? '' : parse(IdParamSchema, { id: req.params.episodeId }, 'address').id,
});

a.get('/:id/therapy', CASE_READERS, async (req) => ({ items: (await getCaseView(services(req), ids(req).caseId, currentUser(req))).therapy }));

a.post('/:id/therapy', CASE_EDITORS, async (req, res) => {
  const out = await addEpisode(services(req), ids(req).caseId, parseBody(TherapyEpisodeCreateSchema, req.body, 'therapy episode'), actorOf(req));
  res.status(201);
  return out;
});

a.patch('/:id/therapy/:episodeId', CASE_EDITORS, async (req) => {
  const { caseId, episodeId } = ids(req);
  return updateEpisode(services(req), caseId, episodeId, parseBody(TherapyEpisodeUpdateSchema, req.body, 'therapy episode'), actorOf(req));
});

/** Removal keeps the row (removed_at, reason); nothing is hard-deleted. */
a.delete('/:id/therapy/:episodeId', CASE_EDITORS, async (req) => {
  const { caseId, episodeId } = ids(req);
  return removeEpisode(services(req), caseId, episodeId, parseBody(RecordRemoveSchema, req.body, 'removal'), actorOf(req));
});

export const therapyRouter = a;
