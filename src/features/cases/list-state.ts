/**
 * The case list's table state in the URL (so a link reproduces the view): page, page size,
 * sort, filters and hidden columns. Parsing is lenient (a hand-edited URL falls back to the
 * defaults); the server validates the query again with the shared CaseListQuerySchema.
 */
import { CASE_SORT_FIELDS } from '../../../shared/registry/list.js';
import type { CaseListParams } from './api/get-cases.js';

export const PAGE_SIZES = [25, 50, 100] as const;
export const DEFAULT_PAGE_SIZE = 50;
export const DEFAULT_SORT = 'surgeryDate.desc';

const LIST_KEYS = ['siteId', 'status', 'procedureCategory', 'riskClass'] as const;
const TEXT_KEYS = ['surgeryFrom', 'surgeryTo', 'outcome', 'q'] as const;

export interface CaseListState {
  params: CaseListParams;
  /** Column ids the user chose to hide. */
  hidden: string[];
}

const positive = (v: string | null, fallback: number) => {
  const n = Number(v);
  return Number.isInteger(n) && n >= 1 ? n : fallback;
};

const splitList = (sp: URLSearchParams, key: string) =>
  sp.getAll(key).flatMap((v) => v.split(',')).map((v) => v.trim()).filter(Boolean);

export function readListState(sp: URLSearchParams): CaseListState {
  const size = positive(sp.get('pageSize'), DEFAULT_PAGE_SIZE);
  const sort = sp.get('sort');
  const sortOk = !!sort && /^[A-Za-z]+\.(asc|desc)$/.test(sort) && (CASE_SORT_FIELDS as readonly string[]).includes(sort.split('.')[0]);
  const params: CaseListParams = {
    page: positive(sp.get('page'), 1),
    pageSize: (PAGE_SIZES as readonly number[]).includes(size) ? size : DEFAULT_PAGE_SIZE,
    sort: sortOk ? sort! : DEFAULT_SORT,
  };
  for (const k of LIST_KEYS) {
    const v = splitList(sp, k);
    if (v.length) params[k] = v;
  }
  for (const k of TEXT_KEYS) {
    const v = sp.get(k)?.trim();
    if (v) params[k] = v;
  }
  return { params, hidden: splitList(sp, 'hide') };
}

/** The URL search string of a state; defaults are left out so links stay short. */
export function writeListState(s: CaseListState): URLSearchParams {
  const sp = new URLSearchParams();
  const p = s.params;
  if (p.page !== 1) sp.set('page', String(p.page));
  if (p.pageSize !== DEFAULT_PAGE_SIZE) sp.set('pageSize', String(p.pageSize));
  if (p.sort && p.sort !== DEFAULT_SORT) sp.set('sort', p.sort);
  for (const k of LIST_KEYS) if (p[k]?.length) sp.set(k, p[k]!.join(','));
  for (const k of TEXT_KEYS) if (p[k]) sp.set(k, p[k]!);
  if (s.hidden.length) sp.set('hide', s.hidden.join(','));
  return sp;
}

/** The query sent to the server: the sort default is sent explicitly so the order is stable. */
export function toApiParams(p: CaseListParams): CaseListParams {
  return { ...p, sort: p.sort ?? DEFAULT_SORT };
}

/** "1–50 of 1,234 cases" or "… of about 1,200,000 cases" when the server gave its estimate. */
export function countText(page: number, pageSize: number, shown: number, total: number, estimate?: boolean): string {
  const n = (x: number) => x.toLocaleString('en-GB');
  if (total === 0 || shown === 0) return estimate ? `No cases on this page (about ${n(total)} in all)` : 'No cases match';
  const from = (page - 1) * pageSize + 1;
  const to = from + shown - 1;
  return `${n(from)}–${n(to)} of ${estimate ? 'about ' : ''}${n(total)} case${total === 1 ? '' : 's'}`;
}
