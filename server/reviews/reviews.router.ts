import { z } from 'zod';
import { area, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { MeasureKeySchema } from '../../shared/committee/measures.js';
import { ActionCreateSchema, ActionUpdateSchema, FindingWriteSchema, MonthParamSchema } from '../../shared/committee/review.js';
import { todayIn } from '../../shared/registry/derived.js';
import { who } from '../committee/who.js';
import { addAction, getReview, listActions, listReviews, members, saveFinding, signOff, updateAction } from './reviews.service.js';

const a = area('/api/reviews');
const READERS = ['admin', 'analyst', 'committee'] as const;
/** Committee members record reviews; the chair (or an admin) signs them off (DESIGN.md). */
const RECORDERS = ['admin', 'committee'] as const;
const CHAIR = { roles: ['admin', 'committee'] as const, chair: true };
const today = (req: Parameters<typeof ctx>[0]) => todayIn(ctx(req).config.NETWORK_TIME_ZONE, new Date());

a.get('/', READERS, async (req) => ({ items: await listReviews(ctx(req).readDs) }));

a.get('/actions', READERS, async (req) => {
  const { status } = parse(z.object({ status: z.enum(['open', 'done', 'all']).default('open') }), req.query, 'query');
  return { items: await listActions(ctx(req).ds, status, today(req)) };
});

a.patch('/actions/:id', READERS, async (req) => {
  const { id } = parse(z.object({ id: z.string().uuid('the address needs an action id') }), req.params, 'address');
  const input = parse(ActionUpdateSchema, req.body, 'action');
  return updateAction(ctx(req).ds, id, input, who(req), today(req));
});

a.get('/members', RECORDERS, async (req) => ({ items: await members(ctx(req).ds) }));

a.get('/:month', READERS, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  return getReview(ctx(req).ds, month, today(req));
});

a.put('/:month/findings/:key', RECORDERS, async (req) => {
  const { month, key } = parse(MonthParamSchema.extend({ key: MeasureKeySchema }), req.params, 'address');
  const input = parse(FindingWriteSchema, req.body, 'finding');
  await saveFinding(ctx(req).ds, month, key, input, who(req));
  return getReview(ctx(req).ds, month, today(req));
});

a.post('/:month/actions', RECORDERS, async (req, res) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  const input = parse(ActionCreateSchema, req.body, 'action');
  res.status(201);
  return addAction(ctx(req).ds, month, input, who(req), today(req));
});

a.post('/:month/sign-off', CHAIR, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  await signOff(ctx(req).ds, month, who(req));
  return getReview(ctx(req).ds, month, today(req));
});

export const reviewsRouter = a;
