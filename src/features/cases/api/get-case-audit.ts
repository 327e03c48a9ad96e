import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '../../../../shared/api/pagination.js';
import type { CaseAuditEntry } from '../../../../shared/registry/record.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const getCaseAudit = (id: string, includeReads: boolean) =>
  get<Page<CaseAuditEntry> | { items: CaseAuditEntry[] }>(`/api/cases/${id}/audit${qs({ includeReads: includeReads ? 'true' : undefined, pageSize: 500 })}`);

export const caseAuditQueryOptions = (id: string, includeReads = false) =>
  queryOptions({ queryKey: queryKeys.cases.audit(id, includeReads), queryFn: () => getCaseAudit(id, includeReads), staleTime: 0 });

export const useCaseAudit = (id: string, includeReads = false) => useQuery(caseAuditQueryOptions(id, includeReads));
