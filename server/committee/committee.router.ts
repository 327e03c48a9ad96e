import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { audit } from '../audit/audit.service.js';
import { appUrl } from '../http/app-url.js';
import { forbidden, notFound } from '../http/errors.js';
import { getJob } from '../jobs/jobs.service.js';
import { registerSchedule } from '../jobs/registry.js';
import { AnnotationCreateSchema } from '../../shared/committee/chart.js';
import { MonthParamSchema, ReasonBodySchema } from '../../shared/committee/review.js';
import { annotationsFor, siteLabel } from '../measures/measures.service.js';
import { monthStart } from '../measures/months.js';
import { closeMonth, monthDetail, publishMonth, recentMonths, reopenMonth } from './months.service.js';
import { notifyNewSignals, runReminderSchedule } from './signals.service.js';
import { packetDir } from './packet.job.js';
import { who } from './who.js';

const a = area('/api/committee');
const READERS = ['admin', 'analyst', 'committee'] as const;
/** Month close, re-open and publish: administrators or the committee chair (DESIGN.md). */
const CHAIR = { roles: ['admin', 'committee'] as const, chair: true };
const IdParam = z.object({ id: z.string().uuid('the address needs an annotation id') });

registerSchedule({ name: 'committee-overdue-actions', everyMs: 6 * 60 * 60 * 1000, run: runReminderSchedule });

a.get('/annotations', READERS, async (req) => {
  const { site } = parse(z.object({ site: z.union([z.literal('network'), z.string().uuid()]).default('network') }), req.query, 'query');
  const { readDs } = ctx(req);
  await siteLabel(readDs, site);
  return { items: await annotationsFor(readDs, site) };
});

a.post('/annotations', READERS, async (req, res) => {
  const input = parse(AnnotationCreateSchema, req.body, 'annotation');
  const { ds } = ctx(req);
  if (input.siteId) await siteLabel(ds, input.siteId);
  const w = who(req);
  const [row] = await ds.query(`INSERT INTO committee_annotations (site_id, month, text, created_by) VALUES ($1, $2::date, $3, $4) RETURNING id`, [input.siteId, monthStart(input.month), input.text, w.id]);
  await audit(ds, { action: 'annotation-added', actorId: w.id, actorEmail: w.email, ip: w.ip, entity: 'annotation', entityId: row.id, newValue: input });
  res.status(201);
  return (await annotationsFor(ds, input.siteId ?? 'network')).find((x) => x.id === row.id);
});

a.delete('/annotations/:id', READERS, async (req) => {
  const { id } = parse(IdParam, req.params, 'address');
  const { ds } = ctx(req);
  const [row] = await ds.query(`SELECT created_by, text FROM committee_annotations WHERE id = $1 AND removed_at IS NULL`, [id]);
  if (!row) throw notFound('the annotation');
  const u = currentUser(req);
  if (row.created_by !== u.id && !u.roles.includes('admin')) throw forbidden('only the author or an administrator can remove a note');
  await ds.query(`UPDATE committee_annotations SET removed_at = now() WHERE id = $1`, [id]);
  const w = who(req);
  await audit(ds, { action: 'annotation-removed', actorId: w.id, actorEmail: w.email, ip: w.ip, entity: 'annotation', entityId: id, oldValue: row.text });
  return { removed: true };
});

a.get('/months', READERS, async (req) => ({ items: await recentMonths(ctx(req).readDs, ctx(req).config.NETWORK_TIME_ZONE) }));

a.get('/months/:month', READERS, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  return monthDetail(ctx(req).ds, month, ctx(req).config.NETWORK_TIME_ZONE);
});

a.post('/months/:month/close', CHAIR, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  const c = ctx(req);
  const result = await closeMonth(c.ds, month, who(req), c.config.NETWORK_TIME_ZONE);
  // After the commit: a mail failure never undoes the close.
  const signalsNotified = await notifyNewSignals(c, month, appUrl(req));
  return { ...result, signalsNotified };
});

a.post('/months/:month/reopen', CHAIR, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  const { reason } = parse(ReasonBodySchema, req.body, 're-open form');
  return reopenMonth(ctx(req).ds, month, reason, who(req));
});

a.post('/months/:month/publish', CHAIR, async (req, res) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  res.status(202);
  return publishMonth(ctx(req).ds, month, who(req), appUrl(req));
});

async function packetJob(req: Parameters<typeof ctx>[0], month: string) {
  const { ds } = ctx(req);
  const [row] = await ds.query(`SELECT packet_job_id FROM committee_month_closes WHERE month = $1::date`, [monthStart(month)]);
  const job = row?.packet_job_id ? await getJob(ds, row.packet_job_id) : null;
  if (!job) throw notFound(`the packet of ${month}`);
  return job;
}

a.get('/months/:month/packet', READERS, async (req) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  return packetJob(req, month);
});

a.get('/months/:month/packet/file', READERS, async (req, res) => {
  const { month } = parse(MonthParamSchema, req.params, 'address');
  const job = await packetJob(req, month);
  const file = job.status === 'succeeded' && typeof job.result?.file === 'string' ? path.join(packetDir(ctx(req)), path.basename(job.result.file)) : null;
  if (!file || !fs.existsSync(file)) throw notFound(`the packet file of ${month} (it is not ready yet)`);
  const w = who(req);
  await audit(ctx(req).ds, { action: 'packet-downloaded', actorId: w.id, actorEmail: w.email, ip: w.ip, entity: 'month', entityId: month, details: { jobId: job.id } });
  res.setHeader('Content-Type', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
  res.setHeader('Content-Disposition', `attachment; filename="alveolog-review-${month}.xlsx"`);
  res.send(fs.readFileSync(file));
});

export const committeeRouter = a;
