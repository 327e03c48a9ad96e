import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { User, UserCreate, UserUpdate } from '../../../../shared/auth/user.js';
import type { Site, SiteWrite, UnitWrite } from '../../../../shared/sites.js';
import { get, patch, post } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export const usersQueryOptions = queryOptions({ queryKey: queryKeys.users.list(), queryFn: () => get<{ items: User[] }>('/api/users') });
export const sitesQueryOptions = queryOptions({ queryKey: queryKeys.sites.list(), queryFn: () => get<{ items: Site[] }>('/api/sites'), staleTime: 5 * 60_000 });
export const mailQueryOptions = queryOptions({
  queryKey: queryKeys.mail.list(),
  queryFn: () => get<{ items: { id: string; receivedAt: string; from: string; to: string[]; subject: string; body: string }[] }>('/api/mail'),
});

export const useUsers = () => useQuery(usersQueryOptions);
export const useSites = () => useQuery(sitesQueryOptions);
export const useMail = () => useQuery(mailQueryOptions);

export function useInviteUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: UserCreate) => post<User>('/api/users', input), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users.all }) });
}
export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: ({ id, ...input }: UserUpdate & { id: string }) => patch<User>(`/api/users/${id}`, input), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users.all }) });
}
export function useSendReset() {
  return useMutation({ mutationFn: (id: string) => post(`/api/users/${id}/password-reset`) });
}
export function useCreateSite() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: SiteWrite) => post<Site>('/api/sites', input), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.sites.all }) });
}
export function useCreateUnit() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: ({ siteId, ...input }: UnitWrite & { siteId: string }) => post(`/api/sites/${siteId}/units`, input), onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.sites.all }) });
}
