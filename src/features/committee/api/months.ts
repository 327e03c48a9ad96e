import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CloseResult, MonthDetail, MonthState } from '../../../../shared/committee/review.js';
import { get, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface JobView { id: string; status: string; progress: Record<string, number | string>; result: Record<string, unknown> | null; error: string | null; finishedAt: string | null }

export const monthsQueryOptions = queryOptions({ queryKey: queryKeys.committee.months(), queryFn: () => get<{ items: MonthState[] }>('/api/committee/months') });
export const useMonths = () => useQuery(monthsQueryOptions);
export const useMonth = (month: string | null) => useQuery({ queryKey: queryKeys.committee.month(month ?? ''), queryFn: () => get<MonthDetail>(`/api/committee/months/${month}`), enabled: !!month });

function useMonthMutation<T>(fn: (month: string, body?: unknown) => Promise<T>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: ({ month, body }: { month: string; body?: unknown }) => fn(month, body), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.committee.all }) });
}
export const useCloseMonth = () => useMonthMutation((m) => post<CloseResult>(`/api/committee/months/${m}/close`));
export const useReopenMonth = () => useMonthMutation((m, body) => post<{ unlocked: number }>(`/api/committee/months/${m}/reopen`, body));
export const usePublishMonth = () => useMonthMutation((m) => post<{ jobId: string }>(`/api/committee/months/${m}/publish`));

/** The month's packet job, polled every second until it ends. */
export const usePacket = (month: string) => useQuery({
  queryKey: queryKeys.committee.packet(month),
  queryFn: () => get<JobView>(`/api/committee/months/${month}/packet`),
  refetchInterval: (q) => (q.state.data && ['queued', 'running'].includes(q.state.data.status) ? 1000 : false),
  retry: false,
});
