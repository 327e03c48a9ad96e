import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { FindingPage } from '../../../../shared/quality/findings.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface FindingParams { siteId?: string; kind?: string; status?: string; page?: number; pageSize?: number }
export const findingsQueryOptions = (p: FindingParams) =>
  queryOptions({ queryKey: queryKeys.quality.findings({ ...p }), queryFn: () => get<FindingPage>(`/api/quality/findings${qs({ ...p })}`), placeholderData: keepPreviousData });
export const useFindings = (p: FindingParams) => useQuery(findingsQueryOptions(p));
