import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ExportAuditEntry } from '../../../../shared/exports/schemas.js';
import { get, qs } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export interface AuditParams { page: number; pageSize: number }
export const getExportAudit = (p: AuditParams) => get<{ items: ExportAuditEntry[]; total: number; page: number; pageSize: number }>(`/api/exports/audit${qs({ ...p })}`);
export const exportAuditQueryOptions = (p: AuditParams) => queryOptions({ queryKey: queryKeys.exports.audit({ ...p }), queryFn: () => getExportAudit(p), placeholderData: keepPreviousData });
export const useExportAudit = (p: AuditParams) => useQuery(exportAuditQueryOptions(p));

/** The CSV of the whole export audit log (a plain link: the browser downloads it with the session cookie). */
export const EXPORT_AUDIT_CSV_URL = '/api/exports/audit.csv';
