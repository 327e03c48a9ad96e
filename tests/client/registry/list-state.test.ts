import { describe, expect, it } from 'vitest';
import { CaseListQuerySchema } from '../../../shared/registry/list.js';
import { countText, readListState, toApiParams, writeListState } from '../../../src/features/cases/list-state.js';

// The independent check: whatever the list page puts in the URL and sends must be accepted by
// the server's own query schema (shared/registry/list.ts), with the same meaning.
const HBR = '7b0c1f0e-8a3a-4c36-9a52-1f6a7f6b3c01';

describe('case list state in the URL', () => {
  it('when a view with filters, sort, page and hidden columns is written and read back, then it is unchanged', () => {
    const state = { params: { page: 3, pageSize: 100, sort: 'ariscatPoints.desc', siteId: [HBR], status: ['complete', 'verified'], riskClass: ['high', 'unscored'], surgeryFrom: '2025-01-01', surgeryTo: '2025-03-31', outcome: 'pneumonia-nhsn', q: 'HBR-2025' }, hidden: ['unitCode', 'updatedAt'] };
    expect(readListState(writeListState(state))).toEqual(state);
  });

  it('when the page sends the query, then the server schema parses it to the same filters', () => {
    const sp = new URLSearchParams('page=2&sort=age.asc&status=draft,complete&riskClass=low&procedureCategory=colorectal&outcome=any-ppc');
    const api = toApiParams(readListState(sp).params);
    const parsed = CaseListQuerySchema.parse(Object.fromEntries(Object.entries(api).map(([k, v]) => [k, Array.isArray(v) ? v.join(',') : String(v)])));
    expect(parsed).toMatchObject({ page: 2, pageSize: 50, sort: 'age.asc', status: ['draft', 'complete'], riskClass: ['low'], procedureCategory: ['colorectal'], outcome: 'any-ppc' });
  });

  it('when the URL carries nonsense, then the defaults are used rather than a broken request', () => {
    const s = readListState(new URLSearchParams('page=-4&pageSize=7&sort=password.asc'));
    expect(s.params).toEqual({ page: 1, pageSize: 50, sort: 'surgeryDate.desc' });
    // The default sort is one the server accepts.
    expect(CaseListQuerySchema.safeParse({ sort: s.params.sort }).success).toBe(true);
  });

  it('when defaults are written, then the link stays short', () => {
    expect(writeListState({ params: { page: 1, pageSize: 50, sort: 'surgeryDate.desc' }, hidden: [] }).toString()).toBe('');
  });
});

describe('count line', () => {
  it('when the server gives an exact total, then the rows shown and the total are written out', () => {
    expect(countText(2, 50, 50, 1234)).toBe('51–100 of 1,234 cases');
  });
  it('when the total is the planner estimate, then it says "about"', () => {
    expect(countText(1, 50, 50, 1_000_000, true)).toBe('1–50 of about 1,000,000 cases');
  });
  it('when nothing matches, then it says so', () => {
    expect(countText(1, 50, 0, 0)).toBe('No cases match');
  });
});
