/**
 * /api/cases/:id/outcomes (the case's outcome events; same roles as the case) and
 * /api/outcomes/reevaluation (re-applying a definition to earlier events as a reviewed list).
 */
import type { Request } from 'express';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { IdParamSchema } from '../../shared/sites.js';
import { OutcomeEventCreateSchema, OutcomeEventUpdateSchema, ReevaluationApplySchema, ReevaluationQuerySchema } from '../../shared/registry/outcome.js';
import { RecordRemoveSchema } from '../../shared/registry/therapy.js';
import { parseBody } from '../registry/validation.js';
import { CASE_EDITORS, CASE_READERS, actorOf } from '../cases/cases.router.js';
import { getCaseView } from '../cases/case.service.js';
import { addEvent, removeEvent, updateEvent } from './outcomes.service.js';
import { applyDefinition, listDifferences } from './reevaluation.service.js';

const services = (req: Request) => ({ ds: ctx(req).ds, config: ctx(req).config });
const ids = (req: Request) => ({
  caseId: parse(IdParamSchema, { id: req.params.id }, 'address').id,
  eventId: req.params.eventId === undefined ? '' : parse(IdParamSchema, { id: req.params.eventId }, 'address').id,
});

const c = area('/api/cases');

c.get('/:id/outcomes', CASE_READERS, async (req) => ({ items: (await getCaseView(services(req), ids(req).caseId, currentUser(req))).outcomes }));

c.post('/:id/outcomes', CASE_EDITORS, async (req, res) => {
  const out = await addEvent(services(req), ids(req).caseId, parseBody(OutcomeEventCreateSchema, req.body, 'outcome event'), actorOf(req));
  res.status(201);
  return out;
});

c.patch('/:id/outcomes/:eventId', CASE_EDITORS, async (req) => {
  const { caseId, eventId } = ids(req);
  return updateEvent(services(req), caseId, eventId, parseBody(OutcomeEventUpdateSchema, req.body, 'outcome event'), actorOf(req));
});

c.delete('/:id/outcomes/:eventId', CASE_EDITORS, async (req) => {
  const { caseId, eventId } = ids(req);
  return removeEvent(services(req), caseId, eventId, parseBody(RecordRemoveSchema, req.body, 'removal'), actorOf(req));
});

export const caseOutcomesRouter = c;

const o = area('/api/outcomes');

o.get('/reevaluation', ['admin', 'abstractor', 'analyst'], async (req) => listDifferences(ctx(req).ds, currentUser(req), parseBody(ReevaluationQuerySchema, req.query, 're-evaluation filter')));

o.post('/reevaluation', ['admin', 'abstractor'], async (req) => applyDefinition(ctx(req).ds, actorOf(req), parseBody(ReevaluationApplySchema, req.body, 're-evaluation')));

export const outcomesRouter = o;
