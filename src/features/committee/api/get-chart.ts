import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ChartResponse, GChartResponse } from '../../../../shared/committee/chart.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface ChartParams { site: string; view: 'monthly' | 'quarterly'; rebase: string[]; to?: string }

export const chartQueryOptions = (key: string, p: ChartParams) => queryOptions({
  queryKey: queryKeys.committee.chart(key, { ...p }),
  queryFn: () => get<ChartResponse>(`/api/measures/${key}/chart${qs({ site: p.site, view: p.view, rebase: p.rebase.join(',') || undefined, to: p.to })}`),
  placeholderData: keepPreviousData,
});
export const useChart = (key: string, p: ChartParams, enabled = true) => useQuery({ ...chartQueryOptions(key, p), enabled });

export const useGChart = (key: string, site: string, enabled: boolean) => useQuery({
  queryKey: queryKeys.committee.gChart(key, site),
  queryFn: () => get<GChartResponse>(`/api/measures/${key}/g-chart${qs({ site })}`),
  enabled,
});
