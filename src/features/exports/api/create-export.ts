import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ExportRequestView } from '../../../../shared/exports/schemas.js';
import type { z } from 'zod';
import type { ExportRequestCreateSchema } from '../../../../shared/exports/schemas.js';
import { post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export type ExportRequestInput = z.input<typeof ExportRequestCreateSchema>;
export const createExport = (input: ExportRequestInput) => post<ExportRequestView>('/api/exports', input);

export function useCreateExport() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createExport, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.exports.all }) });
}
