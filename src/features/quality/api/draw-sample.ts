import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SampleDraw, SampleSummary } from '../../../../shared/quality/reabstraction.js';
import { post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const drawSample = (body: SampleDraw) => post<SampleSummary>('/api/quality/reabstraction/samples', body);
export function useDrawSample() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: drawSample, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.quality.samples() }) });
}
