import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { MeasureDefinition, MeasureKey, MeasureSettings, MeasureSettingsUpdate } from '../../../../shared/committee/measures.js';
import { get, patch } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export type MeasureRow = MeasureDefinition & MeasureSettings;

export const measuresQueryOptions = queryOptions({
  queryKey: queryKeys.committee.measures(),
  queryFn: () => get<{ items: MeasureRow[] }>('/api/measures'),
  staleTime: 60_000,
});
export const useMeasures = () => useQuery(measuresQueryOptions);

export function useUpdateMeasure() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ key, ...change }: MeasureSettingsUpdate & { key: MeasureKey }) => patch<MeasureRow>(`/api/measures/${key}`, change),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.committee.all }),
  });
}
