/**
 * Case capture: a theatre list uploaded as CSV or XLSX is matched against the registry's cases
 * (by keyed hash and surgery date, then by date and category for cases without a hash); the
 * identifiers are never stored or echoed. Rules: shared/quality/capture.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { identifierHash } from '../../../server/registry/identifier-hash.js';
import { startTestApp, type Client, type TestApp } from '../helpers.js';
import { siteIds } from '../registry/factories.js';

let t: TestApp;
let sites: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  sites = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

const upload = (c: Client, siteId: string, body: Buffer, name: string) =>
  c.agent.post('/api/quality/capture/theatre-lists').set('x-csrf-token', c.csrf).field('siteId', siteId).attach('file', body, name);

// June 2021 is before the demo scenario's first month, so only this test's cases are there.
const LIST = `operation date,procedure category,local identifier
2021-06-10,colorectal,QTEST-0001
2021-06-11,Colorectal,QTEST-0002
2021-06-12,thoracic,QTEST-0003
2021-06-10,colorectal,QTEST-0004
`;

describe('case capture', () => {
  it('when a theatre list is uploaded, then each operation is matched once and the missing ones are listed for abstraction', async () => {
    const ab = await t.as('abstractor');
    const mk = async (body: Record<string, unknown>) => {
      const r = await ab.post('/api/cases', { siteId: sites.HBR, procedureCategory: 'colorectal', ...body });
      expect(r.status, JSON.stringify(r.body)).toBe(201);
      return r.body.id as string;
    };
    await mk({ surgeryDate: '2021-06-10', localIdentifier: 'qtest-0001 ' }); // same identifier after trim and case folding
    await mk({ surgeryDate: '2021-06-11' }); // no identifier: matched by date and category
    await mk({ surgeryDate: '2021-06-13', localIdentifier: 'QTEST-0099' }); // in the registry, not on the list

    const r = await upload(ab, sites.HBR, Buffer.from(LIST), 'theatre-june.csv');
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({ rows: 4, fromDate: '2021-06-10', toDate: '2021-06-12', replaced: 0, siteCode: 'HBR' });
    expect(JSON.stringify(r.body)).not.toContain('QTEST');

    // Stored: keyed hashes only (HMAC of site and normalised identifier, RFC 2104), no identifier.
    const stored = await t.ds.query(`SELECT identifier_hash FROM theatre_list_entries WHERE site_id = $1 ORDER BY operation_date, identifier_hash`, [sites.HBR]);
    expect(stored.map((s: { identifier_hash: string }) => s.identifier_hash)).toContain(identifierHash(t.config.IDENTIFIER_HASH_SECRET, sites.HBR, 'QTEST-0001'));
    const dump = JSON.stringify(await t.ds.query(`SELECT * FROM theatre_list_entries`)) + JSON.stringify(await t.ds.query(`SELECT * FROM theatre_list_uploads`)) + JSON.stringify(await t.ds.query(`SELECT * FROM audit_entries WHERE action = 'theatre-list-uploaded'`));
    expect(dump).not.toContain('QTEST');

    const rep = await ab.get(`/api/quality/capture?siteId=${sites.HBR}&from=2021-06&to=2021-06`);
    expect(rep.status).toBe(200);
    expect(rep.body.months).toEqual([{ siteId: sites.HBR, siteCode: 'HBR', month: '2021-06', listed: 4, matchedByIdentifier: 1, matchedByDate: 1, missing: 2, capture: 0.5, notOnList: 1 }]);
    expect(rep.body.missingTotal).toBe(2);
    expect(rep.body.missing.map((m: { operationDate: string; procedureCategory: string }) => `${m.operationDate} ${m.procedureCategory}`).sort()).toEqual(['2021-06-10 colorectal', '2021-06-12 thoracic']);
  });

  it('when a corrected list for the same dates is uploaded as XLSX, then it replaces the earlier one', async () => {
    const ab = await t.as('abstractor');
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Theatre list');
    ws.addRow(['Date', 'Category', 'Identifier']);
    ws.addRow([new Date(Date.UTC(2021, 5, 10)), 'colorectal', 'QTEST-0001']);
    ws.addRow([new Date(Date.UTC(2021, 5, 12)), 'Thoracic', 'QTEST-0003']);
    const r = await upload(ab, sites.HBR, Buffer.from(await wb.xlsx.writeBuffer()), 'corrected.xlsx');
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body).toMatchObject({ rows: 2, replaced: 4 });
    const rep = await ab.get(`/api/quality/capture?siteId=${sites.HBR}&from=2021-06&to=2021-06`);
    expect(rep.body.months[0]).toMatchObject({ listed: 2, matchedByIdentifier: 1, matchedByDate: 0, missing: 1, notOnList: 2 });
  });

  it('when rows are wrong, then 400 names each row and column without echoing any identifier, and nothing is saved', async () => {
    const ab = await t.as('abstractor');
    const before = await t.ds.query(`SELECT count(*)::int AS n FROM theatre_list_entries`);
    const bad = `operation date,procedure category,local identifier\n2021-07-01,colorectal,QTEST-SECRET-1\n01/07/2021,colorectal,QTEST-SECRET-2\n2021-07-02,knees,QTEST-SECRET-3\n2021-07-03,colorectal,\n2021-07-01,colorectal,qtest-secret-1\n`;
    const r = await upload(ab, sites.HBR, Buffer.from(bad), 'bad.csv');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('theatre_list_invalid');
    expect(r.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['row 3, operation date', 'row 4, procedure category', 'row 5, local identifier', 'row 6, local identifier']);
    expect(JSON.stringify(r.body).toUpperCase()).not.toContain('QTEST-SECRET');
    expect(await t.ds.query(`SELECT count(*)::int AS n FROM theatre_list_entries`)).toEqual(before);

    const noCol = await upload(ab, sites.HBR, Buffer.from('date,category\n2021-07-01,colorectal\n'), 'short.csv');
    expect(noCol.status).toBe(400);
    expect(noCol.body.error.message).toContain('"local identifier"');
    const pdf = await upload(ab, sites.HBR, Buffer.from('%PDF-1.4 not a list'), 'list.csv');
    expect(pdf.status).toBe(400);
  });

  it('when someone uploads for another site or without the role, then refused', async () => {
    const ab = await t.as('abstractor');
    const other = await upload(ab, sites.MRB, Buffer.from(LIST), 'x.csv');
    expect(other.status).toBe(404);
    const committee = await t.as('committee');
    expect((await upload(committee, sites.HBR, Buffer.from(LIST), 'x.csv')).status).toBe(403);
    expect((await committee.get(`/api/quality/capture?siteId=${sites.HBR}`)).status).toBe(200);
  });
});
