import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Adjudication, Disagreement } from '../../../../shared/quality/reabstraction.js';
import { post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const adjudicate = (itemId: string, body: Adjudication) => post<Disagreement>(`/api/quality/reabstraction/items/${itemId}/adjudications`, body);
export function useAdjudicate(sampleId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { itemId: string; body: Adjudication }) => adjudicate(v.itemId, v.body),
    onSuccess: () => { qc.invalidateQueries({ queryKey: queryKeys.quality.report(sampleId) }); qc.invalidateQueries({ queryKey: queryKeys.cases.all }); },
  });
}
