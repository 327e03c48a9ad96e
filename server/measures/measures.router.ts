import { z } from 'zod';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { audit, actor } from '../audit/audit.service.js';
import { ChartQuerySchema } from '../../shared/committee/chart.js';
import { MeasureKeySchema, MeasureSettingsUpdateSchema } from '../../shared/committee/measures.js';
import { getMeasure, listMeasures, measureChart, measureGChart, updateMeasureSettings } from './measures.service.js';

const a = area('/api/measures');
/** Network aggregates with site names: admins, analysts and the committee (DESIGN.md role table). */
const READERS = ['admin', 'analyst', 'committee'] as const;
const KeyParam = z.object({ key: MeasureKeySchema });

a.get('/', READERS, async (req) => ({ items: await listMeasures(ctx(req).readDs) }));

a.get('/:key', READERS, async (req) => {
  const { key } = parse(KeyParam, req.params, 'address');
  return getMeasure(ctx(req).readDs, key);
});

a.patch('/:key', ['admin'], async (req) => {
  const { key } = parse(KeyParam, req.params, 'address');
  const change = parse(MeasureSettingsUpdateSchema, req.body, 'measure settings');
  const { ds } = ctx(req);
  const { old, next } = await updateMeasureSettings(ds, key, change, currentUser(req).id);
  await audit(ds, { action: 'measure-settings-changed', ...actor(req), entity: 'measure', entityId: key, oldValue: old, newValue: next });
  return getMeasure(ds, key);
});

a.get('/:key/chart', READERS, async (req) => {
  const { key } = parse(KeyParam, req.params, 'address');
  const q = parse(ChartQuerySchema, req.query, 'chart query');
  const c = ctx(req);
  return measureChart(c.readDs, key, q, { timeZone: c.config.NETWORK_TIME_ZONE });
});

a.get('/:key/g-chart', READERS, async (req) => {
  const { key } = parse(KeyParam, req.params, 'address');
  const q = parse(ChartQuerySchema.pick({ site: true, from: true, to: true }), req.query, 'chart query');
  const c = ctx(req);
  return measureGChart(c.readDs, key, q.site, q, { timeZone: c.config.NETWORK_TIME_ZONE });
});

export const measuresRouter = a;
