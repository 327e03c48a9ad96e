import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ExportVariable } from '../../../../shared/exports/variables.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface VariablesResponse { items: ExportVariable[]; studyId: { name: string; label: string; deidentification: string }; aggregateDimensions: string[] }

export const getExportVariables = () => get<VariablesResponse>('/api/exports/variables');
export const exportVariablesQueryOptions = queryOptions({ queryKey: queryKeys.exports.variables(), queryFn: getExportVariables, staleTime: 10 * 60_000 });
export const useExportVariables = () => useQuery(exportVariablesQueryOptions);
