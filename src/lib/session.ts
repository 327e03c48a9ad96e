import { useQuery, queryOptions } from '@tanstack/react-query';
import type { MeResponse, SessionUser } from '../../shared/auth/user.js';
import type { Role } from '../../shared/auth/roles.js';
import { ApiError, get, setCsrfToken } from './api-client.js';
import { queryKeys } from './query-keys.js';

export const meQueryOptions = queryOptions({
  queryKey: queryKeys.me,
  queryFn: async (): Promise<MeResponse | null> => {
    try {
      const me = await get<MeResponse>('/api/auth/me');
      setCsrfToken(me.csrfToken);
      return me;
    } catch (e) {
      if (e instanceof ApiError && e.status === 401) return null;
      throw e;
    }
  },
  staleTime: 60_000,
});

export function useSession() {
  return useQuery(meQueryOptions);
}

export function userHasAccess(user: SessionUser, roles: readonly Role[] | 'signed-in', chair = false): boolean {
  if (roles === 'signed-in') return true;
  if (chair) return user.roles.includes('admin') || (user.roles.includes('committee') && user.isChair);
  return user.roles.some((r) => roles.includes(r));
}
