import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Worklist } from '../../../../shared/registry/worklist.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface WorklistParams { siteId?: string; dueWithinDays?: number }

export const getWorklist = (p: WorklistParams) => get<Worklist>(`/api/worklist${qs({ ...p })}`);
export const worklistQueryOptions = (p: WorklistParams) => queryOptions({ queryKey: queryKeys.worklist.list({ ...p }), queryFn: () => getWorklist(p), staleTime: 0 });
export const useWorklist = (p: WorklistParams) => useQuery(worklistQueryOptions(p));
