import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CompletenessReport } from '../../../../shared/quality/completeness.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface CompletenessParams { siteId?: string; month?: string; months?: number }
export const completenessQueryOptions = (p: CompletenessParams) =>
  queryOptions({ queryKey: queryKeys.quality.completeness({ ...p }), queryFn: () => get<CompletenessReport>(`/api/quality/completeness${qs({ ...p })}`), placeholderData: keepPreviousData });
export const useCompleteness = (p: CompletenessParams) => useQuery(completenessQueryOptions(p));
