import { queryOptions, useQuery } from '@tanstack/react-query';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface Abstractor { id: string; email: string; displayName: string }
export const abstractorsQueryOptions = (siteIds: readonly string[]) =>
  queryOptions({ queryKey: queryKeys.quality.abstractors(siteIds), queryFn: () => get<Abstractor[]>(`/api/quality/reabstraction/abstractors${qs({ siteId: siteIds.join(',') })}`), enabled: siteIds.length > 0 });
export const useAbstractors = (siteIds: readonly string[]) => useQuery(abstractorsQueryOptions(siteIds));
