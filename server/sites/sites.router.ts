import { area, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { audit, actor } from '../audit/audit.service.js';
import { IdParamSchema, SiteWriteSchema, UnitWriteSchema, type Site } from '../../shared/sites.js';
import { AppError, notFound } from '../http/errors.js';

const a = area('/api/sites');

async function listSites(req: Parameters<typeof ctx>[0]): Promise<Site[]> {
  const rows = await ctx(req).ds.query(
    `SELECT s.id, s.code, s.name, s.inclusion_criteria, s.exclusion_criteria, s.active,
            COALESCE(json_agg(json_build_object('id', u.id, 'siteId', u.site_id, 'code', u.code, 'name', u.name, 'kind', u.kind, 'active', u.active) ORDER BY u.code) FILTER (WHERE u.id IS NOT NULL), '[]') AS units
       FROM sites s LEFT JOIN units u ON u.site_id = s.id GROUP BY s.id ORDER BY s.name`,
  );
  return rows.map((r: any) => ({ id: r.id, code: r.code, name: r.name, inclusionCriteria: r.inclusion_criteria, exclusionCriteria: r.exclusion_criteria, active: r.active, units: r.units }));
}

/** The network's sites and units (reference data; researchers see sites only as codes in their aggregates). */
a.get('/', ['admin', 'abstractor', 'analyst', 'committee'], async (req) => ({ items: await listSites(req) }));

function uniqueViolation(err: unknown, what: string): never {
  if ((err as { code?: string }).code === '23505') throw new AppError(409, 'code_taken', `${what} code is already used`, { fields: [{ path: 'code', message: 'already used' }], hint: 'choose another code' });
  throw err;
}

a.post('/', ['admin'], async (req, res) => {
  const input = parse(SiteWriteSchema, req.body, 'site form');
  const { ds } = ctx(req);
  const [row] = await ds.query(`INSERT INTO sites (code, name, inclusion_criteria, exclusion_criteria, active) VALUES ($1, $2, $3, $4, $5) RETURNING id`,
    [input.code, input.name, input.inclusionCriteria, input.exclusionCriteria, input.active]).catch((e) => uniqueViolation(e, 'the site'));
  await audit(ds, { action: 'site-created', ...actor(req), entity: 'site', entityId: row.id, newValue: input });
  res.status(201);
  return (await listSites(req)).find((s) => s.id === row.id);
});

a.patch('/:id', ['admin'], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const input = parse(SiteWriteSchema.partial(), req.body, 'site form');
  const { ds } = ctx(req);
  const before = (await listSites(req)).find((s) => s.id === id);
  if (!before) throw notFound('the site');
  await ds.query(`UPDATE sites SET code = COALESCE($2, code), name = COALESCE($3, name), inclusion_criteria = COALESCE($4, inclusion_criteria), exclusion_criteria = COALESCE($5, exclusion_criteria), active = COALESCE($6, active) WHERE id = $1`,
    [id, input.code ?? null, input.name ?? null, input.inclusionCriteria ?? null, input.exclusionCriteria ?? null, input.active ?? null]).catch((e) => uniqueViolation(e, 'the site'));
  const after = (await listSites(req)).find((s) => s.id === id)!;
  await audit(ds, Object.keys(input).map((f) => ({ action: 'site-changed', ...actor(req), entity: 'site', entityId: id, field: f, oldValue: (before as any)[f], newValue: (after as any)[f] })));
  return after;
});

a.post('/:id/units', ['admin'], async (req, res) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const input = parse(UnitWriteSchema, req.body, 'unit form');
  const { ds } = ctx(req);
  if (!(await ds.query(`SELECT 1 FROM sites WHERE id = $1`, [id])).length) throw notFound('the site');
  const [row] = await ds.query(`INSERT INTO units (site_id, code, name, kind, active) VALUES ($1, $2, $3, $4, $5) RETURNING id`, [id, input.code, input.name, input.kind, input.active]).catch((e) => uniqueViolation(e, 'the unit'));
  await audit(ds, { action: 'unit-created', ...actor(req), entity: 'unit', entityId: row.id, newValue: input });
  res.status(201);
  return { id: row.id, siteId: id, ...input };
});

a.patch('/:id/units/:unitId', ['admin'], async (req) => {
  const { id } = parse(IdParamSchema, req.params, 'address');
  const { id: unitId } = parse(IdParamSchema, { id: req.params.unitId }, 'address');
  const input = parse(UnitWriteSchema.partial(), req.body, 'unit form');
  const { ds } = ctx(req);
  const res = await ds.query(`UPDATE units SET code = COALESCE($3, code), name = COALESCE($4, name), kind = COALESCE($5, kind), active = COALESCE($6, active) WHERE id = $2 AND site_id = $1 RETURNING id, site_id, code, name, kind, active`,
    [id, unitId, input.code ?? null, input.name ?? null, input.kind ?? null, input.active ?? null]).catch((e) => uniqueViolation(e, 'the unit'));
  const row = res[0]?.[0];
  if (!row) throw notFound('the unit');
  await audit(ds, { action: 'unit-changed', ...actor(req), entity: 'unit', entityId: unitId, newValue: input });
  return { id: row.id, siteId: row.site_id, code: row.code, name: row.name, kind: row.kind, active: row.active };
});

export const sitesRouter = a;
