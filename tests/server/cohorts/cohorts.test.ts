import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';

// Saved cohorts (issue 6): private or shared with the network's analysts and committee (DESIGN.md).
let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t?.close(); });

const FILTER = { from: '2024-01-01', to: '2024-12-31', ariscatClasses: ['high'], therapy: 'yes' };

describe('saved cohorts', () => {
  it('when an analyst saves a shared cohort, then committee members see it, abstractors and researchers do not, and the audit trail has it', async () => {
    const analyst = await t.as('analyst');
    const res = await analyst.post('/api/cohorts', { name: 'High risk 2024 with therapy', filter: FILTER, shared: true });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.filter).toEqual(FILTER);
    expect(res.body.mine).toBe(true);
    const id = res.body.id as string;
    const committee = await t.as('committee');
    const list = await committee.get('/api/cohorts');
    expect(list.body.items.map((c: { id: string }) => c.id)).toContain(id);
    expect((await committee.get(`/api/cohorts/${id}`)).status).toBe(200);
    for (const key of ['abstractor', 'researcher'] as const) {
      const c = await t.as(key);
      expect((await c.get('/api/cohorts')).body.items.map((x: { id: string }) => x.id)).not.toContain(id);
      expect((await c.get(`/api/cohorts/${id}`)).status).toBe(404);
    }
    const audit = await t.ds.query(`SELECT action FROM audit_entries WHERE entity = 'saved_cohort' AND entity_id = $1`, [id]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['create']);
  });

  it('when someone other than the owner changes a shared cohort, then it is refused; the owner may rename, unshare and delete it', async () => {
    const analyst = await t.as('analyst');
    const { body } = await analyst.post('/api/cohorts', { name: 'Owner only', filter: { sites: [] }, shared: true });
    const chair = await t.as('chair');
    const denied = await chair.patch(`/api/cohorts/${body.id}`, { name: 'Taken over' });
    expect(denied.status).toBe(403);
    expect((await chair.delete(`/api/cohorts/${body.id}`)).status).toBe(403);
    const renamed = await analyst.patch(`/api/cohorts/${body.id}`, { name: 'Owner only, renamed', shared: false });
    expect(renamed.status).toBe(200);
    expect(renamed.body).toMatchObject({ name: 'Owner only, renamed', shared: false });
    // The change and its audit entry are written by one statement: both are there, with the old values.
    const trail = await t.ds.query(`SELECT action, old_value::jsonb->>'name' AS old_name, new_value::jsonb->>'name' AS new_name FROM audit_entries WHERE entity = 'saved_cohort' AND entity_id = $1 ORDER BY id`, [body.id]);
    expect(trail).toEqual([{ action: 'create', old_name: null, new_name: 'Owner only' }, { action: 'update', old_name: 'Owner only', new_name: 'Owner only, renamed' }]);
    // Renamed onto a name the owner already uses: refused, and neither the row nor the trail changes.
    await analyst.post('/api/cohorts', { name: 'Taken', filter: {} });
    const clash = await analyst.patch(`/api/cohorts/${body.id}`, { name: 'Taken' });
    expect(clash.status).toBe(409);
    expect((await analyst.get(`/api/cohorts/${body.id}`)).body.name).toBe('Owner only, renamed');
    expect((await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE entity = 'saved_cohort' AND entity_id = $1`, [body.id]))[0].n).toBe(2);
    expect((await chair.get(`/api/cohorts/${body.id}`)).status).toBe(404);
    expect((await analyst.delete(`/api/cohorts/${body.id}`)).status).toBe(204);
    expect((await analyst.get(`/api/cohorts/${body.id}`)).status).toBe(404);
  });

  it('when the name is taken, the filter is invalid or an abstractor tries to share, then the answer says what to fix and nothing is saved', async () => {
    const analyst = await t.as('analyst');
    await analyst.post('/api/cohorts', { name: 'Duplicate name', filter: {} });
    const dup = await analyst.post('/api/cohorts', { name: 'Duplicate name', filter: {} });
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toContain('Duplicate name');
    // Drafts never count in analyses; a range that ends before it starts is named on its end date.
    const bad = await analyst.post('/api/cohorts', { name: 'Bad', filter: { statuses: ['draft'] } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['filter.statuses.0']);
    const order = await analyst.post('/api/cohorts', { name: 'Bad', filter: { from: '2024-05-01', to: '2024-01-01' } });
    expect(order.status).toBe(400);
    expect(order.body.error.fields[0]).toMatchObject({ path: 'filter.to', message: expect.stringContaining('swap') });
    const abstractor = await t.as('abstractor');
    const share = await abstractor.post('/api/cohorts', { name: 'Mine', filter: {}, shared: true });
    expect(share.status).toBe(403);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM saved_cohorts WHERE name IN ('Bad', 'Mine')`);
    expect(n).toBe(0);
    expect((await abstractor.post('/api/cohorts', { name: 'Mine', filter: {} })).status).toBe(201);
  });
});
