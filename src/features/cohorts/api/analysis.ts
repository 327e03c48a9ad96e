import { queryOptions, useQuery, keepPreviousData } from '@tanstack/react-query';
import type { CohortPage, Comparison, Funnel, Series } from '../../../../shared/analysis/results.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

/** Every analysis view takes its cohort(s) and options as one query string (the page's URL). */
export const cohortPageQueryOptions = (query: string) =>
  queryOptions({ queryKey: queryKeys.analysis.cohort(query), queryFn: () => get<CohortPage>(`/api/analysis/cohort?${query}`), placeholderData: keepPreviousData });
export const useCohortPage = (query: string) => useQuery(cohortPageQueryOptions(query));

export const comparisonQueryOptions = (query: string) =>
  queryOptions({ queryKey: queryKeys.analysis.compare(query), queryFn: () => get<Comparison>(`/api/analysis/compare?${query}`), placeholderData: keepPreviousData });
export const useComparison = (query: string) => useQuery(comparisonQueryOptions(query));

export const seriesQueryOptions = (query: string) =>
  queryOptions({ queryKey: queryKeys.analysis.series(query), queryFn: () => get<Series>(`/api/analysis/series?${query}`), placeholderData: keepPreviousData });
export const useSeries = (query: string) => useQuery(seriesQueryOptions(query));

export const funnelQueryOptions = (query: string) =>
  queryOptions({ queryKey: queryKeys.analysis.funnel(query), queryFn: () => get<Funnel>(`/api/analysis/funnel?${query}`), placeholderData: keepPreviousData });
export const useFunnel = (query: string) => useQuery(funnelQueryOptions(query));

/** The workbook of a view: a plain link (the browser downloads it with the session cookie). */
export const exportUrl = (view: 'cohort' | 'compare' | 'series' | 'funnel', query: string) => `/api/analysis/export/${view}?${query}`;
