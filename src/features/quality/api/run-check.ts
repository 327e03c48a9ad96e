import { useMutation } from '@tanstack/react-query';
import { get, post } from '../../../lib/api-client.js';

export const runConsistencyCheck = (siteIds?: string[]) => post<{ jobId: string; siteIds: string[] }>('/api/quality/checks', siteIds ? { siteIds } : {});
export const useRunCheck = () => useMutation({ mutationFn: runConsistencyCheck });
export interface JobView { id: string; status: string; progress: Record<string, unknown> | null; result: Record<string, unknown> | null; error: string | null }
export const getJob = (id: string) => get<JobView>(`/api/jobs/${id}`);
