import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SampleSummary } from '../../../../shared/quality/reabstraction.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const samplesQueryOptions = () => queryOptions({ queryKey: queryKeys.quality.samples(), queryFn: () => get<SampleSummary[]>('/api/quality/reabstraction/samples') });
export const useSamples = () => useQuery(samplesQueryOptions());
