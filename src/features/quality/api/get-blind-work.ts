import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BlindWork } from '../../../../shared/quality/reabstraction.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** The second abstractor's work list: never the first values. */
export const blindWorkQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.quality.blind(id), queryFn: () => get<BlindWork>(`/api/quality/reabstraction/samples/${id}/blind`) });
export const useBlindWork = (id: string) => useQuery(blindWorkQueryOptions(id));
