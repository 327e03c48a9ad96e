import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Annotation, AnnotationCreate } from '../../../../shared/committee/chart.js';
import { del, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** Notes appear on every chart of their site: refresh all charts after a change. */
export function useAddAnnotation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (a: AnnotationCreate) => post<Annotation>('/api/committee/annotations', a), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.committee.all }) });
}
export function useRemoveAnnotation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (id: string) => del(`/api/committee/annotations/${id}`), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.committee.all }) });
}
