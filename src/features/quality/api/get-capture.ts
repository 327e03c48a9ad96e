import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CaptureReport } from '../../../../shared/quality/capture.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface CaptureParams { siteId?: string; from?: string; to?: string }
export const captureQueryOptions = (p: CaptureParams) =>
  queryOptions({ queryKey: queryKeys.quality.capture({ ...p }), queryFn: () => get<CaptureReport>(`/api/quality/capture${qs({ ...p })}`), placeholderData: keepPreviousData });
export const useCapture = (p: CaptureParams) => useQuery(captureQueryOptions(p));
