import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Action, ActionCreate, ActionUpdate, FindingWrite, Member, Review } from '../../../../shared/committee/review.js';
import { get, patch, post, put } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface ReviewSummary { month: string; status: 'draft' | 'signed'; signedBy: string | null; signedAt: string | null; findings: number; signals: number; openActions: number }

export const useReviews = () => useQuery({ queryKey: queryKeys.committee.reviews(), queryFn: () => get<{ items: ReviewSummary[] }>('/api/reviews') });
export const useReview = (month: string) => useQuery({ queryKey: queryKeys.committee.review(month), queryFn: () => get<Review>(`/api/reviews/${month}`) });
export const useActions = (status: 'open' | 'done' | 'all') => useQuery({ queryKey: queryKeys.committee.actions(status), queryFn: () => get<{ items: Action[] }>(`/api/reviews/actions?status=${status}`) });
export const useMembers = (enabled = true) => useQuery({ queryKey: queryKeys.committee.members(), queryFn: () => get<{ items: Member[] }>('/api/reviews/members'), enabled, staleTime: 5 * 60_000 });

function useInvalidate() {
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: queryKeys.committee.all });
}
export function useSaveFinding() {
  const onSuccess = useInvalidate();
  return useMutation({ mutationFn: ({ month, key, ...body }: FindingWrite & { month: string; key: string }) => put<Review>(`/api/reviews/${month}/findings/${key}`, body), onSuccess });
}
export function useAddAction() {
  const onSuccess = useInvalidate();
  return useMutation({ mutationFn: ({ month, ...body }: ActionCreate & { month: string }) => post<Action>(`/api/reviews/${month}/actions`, body), onSuccess });
}
export function useUpdateAction() {
  const onSuccess = useInvalidate();
  return useMutation({ mutationFn: ({ id, ...body }: ActionUpdate & { id: string }) => patch<Action>(`/api/reviews/actions/${id}`, body), onSuccess });
}
export function useSignOff() {
  const onSuccess = useInvalidate();
  return useMutation({ mutationFn: (month: string) => post<Review>(`/api/reviews/${month}/sign-off`), onSuccess });
}
