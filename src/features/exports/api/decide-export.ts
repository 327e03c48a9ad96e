import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { ExportDecisionSchema, ExportRequestView, RiskReport } from '../../../../shared/exports/schemas.js';
import { get, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export type DecisionInput = z.input<typeof ExportDecisionSchema>;

export const getExportRisk = (id: string) => get<RiskReport>(`/api/exports/${id}/risk`);
export const exportRiskQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.exports.risk(id), queryFn: () => getExportRisk(id) });
export const useExportRisk = (id: string, enabled: boolean) => useQuery({ ...exportRiskQueryOptions(id), enabled });

export const decideExport = ({ id, ...d }: DecisionInput & { id: string }) => post<ExportRequestView>(`/api/exports/${id}/decision`, d);
export function useDecideExport() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: decideExport, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.exports.all }) });
}
