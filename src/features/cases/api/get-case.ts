import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Case } from '../../../../shared/registry/record.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const getCase = (id: string) => get<Case>(`/api/cases/${id}`);

export const caseQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.cases.detail(id), queryFn: () => getCase(id), staleTime: 0 });

export const useCase = (id: string) => useQuery(caseQueryOptions(id));
