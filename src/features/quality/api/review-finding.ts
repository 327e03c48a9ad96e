import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Finding } from '../../../../shared/quality/findings.js';
import { post } from '../../../lib/api-client.js';

export const reviewFinding = (id: string, reason: string) => post<Finding>(`/api/quality/findings/${id}/review`, { reason });
export function useReviewFinding() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (v: { id: string; reason: string }) => reviewFinding(v.id, v.reason), onSuccess: () => qc.invalidateQueries({ queryKey: ['quality', 'findings'] }) });
}
