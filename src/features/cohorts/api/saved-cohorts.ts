import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SavedCohort, SavedCohortCreate, SavedCohortUpdate } from '../../../../shared/analysis/cohorts.js';
import { del, get, patch, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const savedCohortsQueryOptions = queryOptions({ queryKey: queryKeys.cohorts.list(), queryFn: () => get<{ items: SavedCohort[] }>('/api/cohorts') });
export const useSavedCohorts = () => useQuery(savedCohortsQueryOptions);

export function useCreateCohort() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (body: SavedCohortCreate) => post<SavedCohort>('/api/cohorts', body), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.cohorts.all }) });
}
export function useUpdateCohort() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: ({ id, body }: { id: string; body: SavedCohortUpdate }) => patch<SavedCohort>(`/api/cohorts/${id}`, body), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.cohorts.all }) });
}
export function useDeleteCohort() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (id: string) => del<void>(`/api/cohorts/${id}`), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.cohorts.all }) });
}
