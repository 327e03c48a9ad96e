import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CaseCreate, CaseUpdate } from '../../../../shared/registry/case.js';
import type { Case } from '../../../../shared/registry/record.js';
import type { StatusChange } from '../../../../shared/registry/status.js';
import { patch, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const createCase = (body: CaseCreate) => post<Case>('/api/cases', body);
export const updateCase = (id: string, body: CaseUpdate) => patch<Case>(`/api/cases/${id}`, body);
export const changeStatus = (id: string, body: StatusChange) => post<Case>(`/api/cases/${id}/status`, body);

/** Every write answers with the whole case: put it in the cache and refresh lists and the worklist. */
export function useCaseWritten() {
  const qc = useQueryClient();
  return (c: Case) => {
    qc.setQueryData(queryKeys.cases.detail(c.id), c);
    void qc.invalidateQueries({ queryKey: ['cases', 'list'] });
    void qc.invalidateQueries({ queryKey: ['cases', 'detail', c.id, 'audit'] });
    void qc.invalidateQueries({ queryKey: queryKeys.worklist.all });
  };
}

export function useChangeStatus(id: string) {
  const written = useCaseWritten();
  return useMutation({ mutationFn: (body: StatusChange) => changeStatus(id, body), onSuccess: written });
}
