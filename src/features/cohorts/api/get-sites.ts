import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Site } from '../../../../shared/sites.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** Sites and units for the filters (researchers may not list sites: the filter hides them). */
export const cohortSitesQueryOptions = queryOptions({ queryKey: queryKeys.sites.list(), queryFn: () => get<{ items: Site[] }>('/api/sites'), staleTime: 5 * 60_000 });
export const useCohortSites = (enabled: boolean) => useQuery({ ...cohortSitesQueryOptions, enabled });
