/**
 * Every TanStack Query key, nested resource -> list/detail -> params, so invalidation is precise.
 * Features add their keys here.
 */
export const queryKeys = {
  me: ['auth', 'me'] as const,
  users: { all: ['users'] as const, list: () => ['users', 'list'] as const },
  sites: { all: ['sites'] as const, list: () => ['sites', 'list'] as const },
  mail: { list: () => ['mail', 'list'] as const },
  jobs: { detail: (id: string) => ['jobs', id] as const },
};
