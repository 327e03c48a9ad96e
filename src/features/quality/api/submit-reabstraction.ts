import { useMutation, useQueryClient } from '@tanstack/react-query';
import { post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const submitReabstraction = (itemId: string, values: Record<string, unknown>) => post<{ id: string; enteredAt: string }>(`/api/quality/reabstraction/items/${itemId}`, { values });
export function useSubmitReabstraction(sampleId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { itemId: string; values: Record<string, unknown> }) => submitReabstraction(v.itemId, v.values),
    onSuccess: () => { qc.invalidateQueries({ queryKey: queryKeys.quality.blind(sampleId) }); qc.invalidateQueries({ queryKey: queryKeys.quality.samples() }); },
  });
}
