import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AgreementReport } from '../../../../shared/quality/reabstraction.js';
import { get } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const agreementReportQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.quality.report(id), queryFn: () => get<AgreementReport>(`/api/quality/reabstraction/samples/${id}/report`) });
export const useAgreementReport = (id: string) => useQuery(agreementReportQueryOptions(id));
export const agreementWorkbookUrl = (id: string) => `/api/quality/reabstraction/samples/${id}/report.xlsx`;
