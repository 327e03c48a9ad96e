import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Site } from '../../../../shared/sites.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** The network's sites (for the site filters). */
export const sitesQueryOptions = queryOptions({ queryKey: queryKeys.sites.list(), queryFn: () => get<{ items: Site[] }>('/api/sites'), staleTime: 5 * 60_000 });
export const useSites = () => useQuery(sitesQueryOptions);
