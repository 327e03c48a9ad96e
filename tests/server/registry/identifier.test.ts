// De-identification (issue 3): the hospital's identifier is normalised (trim, case), keyed-hashed
// with the site (HMAC, RFC 2104, with SHA-256, FIPS 180-4) and only the hash is stored; it is never
// logged or echoed. Same hash + surgery date = entered twice; same hash alone = returning patient.
import { createHmac } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { logger } from '../../../server/logger.js';
import { completeCase, createCase, daysAgo, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

/** Every text, JSON and array column of every table whose value contains `needle` (case-insensitive). */
async function findEverywhere(needle: string): Promise<string[]> {
  const cols: { table_name: string; column_name: string }[] = await t.ds.query(
    `SELECT c.table_name, c.column_name FROM information_schema.columns c JOIN information_schema.tables tb ON tb.table_name = c.table_name AND tb.table_schema = c.table_schema
      WHERE c.table_schema = 'public' AND tb.table_type = 'BASE TABLE' AND c.data_type IN ('text', 'character varying', 'json', 'jsonb', 'ARRAY')`,
  );
  const hits: string[] = [];
  for (const c of cols) {
    const [r] = await t.ds.query(`SELECT count(*)::int AS n FROM "${c.table_name}" WHERE "${c.column_name}"::text ILIKE '%' || $1 || '%'`, [needle]);
    if (r.n > 0) hits.push(`${c.table_name}.${c.column_name}`);
  }
  return hits;
}

describe('keyed hash of the local identifier', () => {
  it('when an identifier is typed, then only its HMAC is stored: the identifier is in no table, no answer and no log line', async () => {
    const ident = 'mrn-ZX81-7731';
    const calls: unknown[][] = [];
    const spies = (['trace', 'debug', 'info', 'warn', 'error', 'fatal'] as const).map((lvl) => vi.spyOn(logger, lvl).mockImplementation(((...a: unknown[]) => { calls.push(a); }) as never));
    const ab = await t.as('abstractor');
    const r = await ab.post('/api/cases', completeCase(site.HBR, { localIdentifier: `  ${ident.toLowerCase()} ` }));
    const bad = await ab.post('/api/cases', completeCase(site.HBR, { localIdentifier: ident, dischargeDate: daysAgo(70) }));
    spies.forEach((s) => s.mockRestore());
    expect(r.status).toBe(201);
    expect(bad.status).toBe(400);
    expect(r.body.hasLocalIdentifier).toBe(true);
    for (const text of [JSON.stringify(r.body), JSON.stringify(bad.body), JSON.stringify(calls)]) {
      expect(text.toUpperCase()).not.toContain(ident.toUpperCase());
    }
    expect(await findEverywhere(ident)).toEqual([]);
    expect(await findEverywhere('ZX81-7731')).toEqual([]);
    // The stored value is HMAC-SHA-256(secret, siteId + U+001F + trimmed upper-case identifier).
    const [row] = await t.ds.query(`SELECT identifier_hash FROM surgical_cases WHERE id = $1`, [r.body.id]);
    const expected = createHmac('sha256', t.config.IDENTIFIER_HASH_SECRET).update(`${site.HBR}\u001fMRN-ZX81-7731`).digest('hex');
    expect(row.identifier_hash).toBe(expected);
    expect(row.identifier_hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('when the same patient is entered twice with the same surgery date, then the second is refused with 409 unless acknowledged', async () => {
    const ab = await t.as('abstractor');
    const first = await createCase(ab, completeCase(site.HBR, { localIdentifier: 'DUP-1001' }));
    const again = await ab.post('/api/cases', completeCase(site.HBR, { localIdentifier: ' dup-1001' }));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('possible_duplicate');
    expect(again.body.error.details.registryNumbers).toEqual([first.registryNumber]);
    expect(JSON.stringify(again.body)).not.toMatch(/DUP-1001/i);
    const ack = await ab.post('/api/cases', completeCase(site.HBR, { localIdentifier: 'DUP-1001', acknowledgeDuplicate: true }));
    expect(ack.status).toBe(201);
    expect(ack.body.possibleDuplicate).toBe(true);
    expect(ack.body.warnings.map((w: { code: string }) => w.code)).toContain('possible-duplicate');
  });

  it('when the same patient comes back for another operation, then the case is flagged as a returning patient', async () => {
    const ab = await t.as('abstractor');
    const earlier = await createCase(ab, completeCase(site.HBR, { localIdentifier: 'RET-2002', surgeryDate: daysAgo(200), admissionDate: daysAgo(201), dischargeDate: daysAgo(195), followUpCompletedOn: daysAgo(160) }));
    const later = await createCase(ab, completeCase(site.HBR, { localIdentifier: 'ret-2002' }));
    expect(later.otherCasesOfPatient).toEqual([earlier.registryNumber]);
    expect(later.warnings.map((w: { code: string }) => w.code)).toContain('returning-patient');
    expect(later.possibleDuplicate).toBe(false);
  });

  it('when the same identifier is typed at another site, then it is a different hash (keyed with the site)', async () => {
    const ab = await t.as('abstractor');
    const a = await createCase(ab, completeCase(site.HBR, { localIdentifier: 'SITE-3003' }));
    const b = await createCase(ab, completeCase(site.KSV, { localIdentifier: 'SITE-3003' }));
    expect(b.otherCasesOfPatient).toEqual([]);
    const rows = await t.ds.query(`SELECT identifier_hash FROM surgical_cases WHERE id = ANY($1::uuid[])`, [[a.id, b.id]]);
    expect(rows[0].identifier_hash).not.toBe(rows[1].identifier_hash);
  });

  it('when an identifier is added later by update, then the audit trail records that a hash was recorded, never the value', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.patch(`/api/cases/${k.id}`, { version: k.version, localIdentifier: 'LATE-4004' });
    expect(r.status).toBe(200);
    expect(r.body.hasLocalIdentifier).toBe(true);
    const trail = (await ab.get(`/api/cases/${k.id}/audit`)).body.items.filter((e: any) => e.field === 'localIdentifier');
    expect(trail).toHaveLength(1);
    expect(trail[0].newValue).toBe('(keyed hash recorded)');
    expect(await findEverywhere('LATE-4004')).toEqual([]);
  });
});
