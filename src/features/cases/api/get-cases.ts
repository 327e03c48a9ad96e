import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CaseListPage } from '../../../../shared/registry/list.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** The list query as the URL carries it (strings and string lists, already validated by the server). */
export interface CaseListParams {
  page: number;
  pageSize: number;
  sort?: string;
  siteId?: string[];
  surgeryFrom?: string;
  surgeryTo?: string;
  status?: string[];
  procedureCategory?: string[];
  riskClass?: string[];
  outcome?: string;
  q?: string;
}

export const getCases = (p: CaseListParams) => get<CaseListPage>(`/api/cases${qs({ ...p })}`);

export const casesQueryOptions = (p: CaseListParams) =>
  queryOptions({ queryKey: queryKeys.cases.list({ ...p }), queryFn: () => getCases(p), placeholderData: keepPreviousData });

export const useCases = (p: CaseListParams) => useQuery(casesQueryOptions(p));
