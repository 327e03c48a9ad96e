import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ExportRequestView } from '../../../../shared/exports/schemas.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const getExports = (scope: 'mine' | 'all') => get<{ items: ExportRequestView[] }>(`/api/exports${qs({ scope })}`);

/** Lists refresh every 2 s while something is generating (the progress bars move). */
export const exportsQueryOptions = (scope: 'mine' | 'all') =>
  queryOptions({
    queryKey: queryKeys.exports.list(scope),
    queryFn: () => getExports(scope),
    refetchInterval: (q) => (q.state.data?.items.some((r) => r.status === 'approved' || r.status === 'generating') ? 2000 : false),
  });
export const useExports = (scope: 'mine' | 'all') => useQuery(exportsQueryOptions(scope));
