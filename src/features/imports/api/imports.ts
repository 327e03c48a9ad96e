/**
 * Import endpoints: fetchers, query options and hooks. An import or job still at work is polled
 * (the progress bar reads the job's counters) until it settles.
 */
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CommitRequest, DryRunRequest, ImportView, Preset, Problem } from '../../../../shared/imports/api.js';
import type { Site } from '../../../../shared/sites.js';
import { api, get, post, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const TEMPLATE_URL = '/api/imports/template';
export const problemsXlsxUrl = (id: string) => `/api/imports/${id}/problems.xlsx`;

/** What GET /api/jobs/:id answers (the fields this feature reads). */
export interface JobView { id: string; status: 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled'; progress: Record<string, number | string>; error: string | null }

const busy = (v: ImportView | undefined) => v?.status === 'validating' || v?.status === 'committing';

export const importQueryOptions = (id: string) =>
  queryOptions({ queryKey: queryKeys.imports.detail(id), queryFn: () => get<ImportView>(`/api/imports/${id}`), refetchInterval: (q) => (busy(q.state.data) ? 1000 : false) });
export const useImport = (id: string) => useQuery(importQueryOptions(id));

export interface ImportPage { items: ImportView[]; total: number; page: number; pageSize: number }
export const importsQueryOptions = (page: number, pageSize: number) =>
  queryOptions({ queryKey: queryKeys.imports.list({ page, pageSize }), queryFn: () => get<ImportPage>(`/api/imports${qs({ page, pageSize })}`), placeholderData: keepPreviousData });
export const useImports = (page: number, pageSize: number) => useQuery(importsQueryOptions(page, pageSize));

export interface ProblemPage { items: Problem[]; total: number; stored: number; problemCount: number; page: number; pageSize: number }
export const problemsQueryOptions = (id: string, page: number, pageSize: number) =>
  queryOptions({ queryKey: queryKeys.imports.problems(id, { page, pageSize }), queryFn: () => get<ProblemPage>(`/api/imports/${id}/problems${qs({ page, pageSize })}`), placeholderData: keepPreviousData });
export const useProblems = (id: string, page: number, pageSize: number, enabled: boolean) => useQuery({ ...problemsQueryOptions(id, page, pageSize), enabled });

/** The job behind a dry run or commit, polled twice a second while it runs. */
export const useJob = (id: string | null) =>
  useQuery({
    queryKey: queryKeys.jobs.detail(id ?? 'none'),
    queryFn: () => get<JobView>(`/api/jobs/${id}`),
    enabled: !!id,
    refetchInterval: (q) => (q.state.data && !['queued', 'running'].includes(q.state.data.status) ? false : 500),
  });

export const usePresets = (siteId: string | undefined) =>
  useQuery({ queryKey: queryKeys.imports.presets(siteId ?? ''), queryFn: () => get<Preset[]>(`/api/imports/presets${qs({ siteId })}`), enabled: !!siteId });

export const useSites = () => useQuery({ queryKey: queryKeys.sites.list(), queryFn: () => get<{ items: Site[] }>('/api/sites'), staleTime: 5 * 60_000 });

export interface UploadInput { file: File; siteId: string; decimal: 'point' | 'comma'; kind: 'cases' | 'therapy' | 'outcomes' }
export function useUpload() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (u: UploadInput) => {
      const fd = new FormData();
      fd.set('siteId', u.siteId);
      fd.set('decimal', u.decimal);
      fd.set('kind', u.kind);
      fd.set('file', u.file);
      return api<ImportView>('POST', '/api/imports', fd);
    },
    onSuccess: (v) => { qc.setQueryData(queryKeys.imports.detail(v.id), v); void qc.invalidateQueries({ queryKey: queryKeys.imports.all }); },
  });
}

function useImportAction<B>(id: string, path: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: B) => post<ImportView>(`/api/imports/${id}/${path}`, body),
    onSuccess: (v) => { qc.setQueryData(queryKeys.imports.detail(id), v); void qc.invalidateQueries({ queryKey: queryKeys.imports.all }); },
  });
}
export const useDryRun = (id: string) => useImportAction<DryRunRequest>(id, 'dry-run');
export const useCommit = (id: string) => useImportAction<CommitRequest>(id, 'commit');
export const useAbandon = (id: string) => useImportAction<Record<string, never>>(id, 'abandon');
