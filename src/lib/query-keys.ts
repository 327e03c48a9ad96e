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
  cases: {
    all: ['cases'] as const,
    list: (params: Record<string, unknown>) => ['cases', 'list', params] as const,
    detail: (id: string) => ['cases', 'detail', id] as const,
    audit: (id: string, includeReads = false) => ['cases', 'detail', id, 'audit', { includeReads }] as const,
  },
  analysis: {
    all: ['analysis'] as const,
    cohort: (query: string) => ['analysis', 'cohort', query] as const,
    compare: (query: string) => ['analysis', 'compare', query] as const,
    series: (query: string) => ['analysis', 'series', query] as const,
    funnel: (query: string) => ['analysis', 'funnel', query] as const,
  },
  cohorts: { all: ['cohorts'] as const, list: () => ['cohorts', 'list'] as const },
  worklist: { all: ['worklist'] as const, list: (params: Record<string, unknown>) => ['worklist', params] as const },
  dictionary: { all: ['dictionary'] as const },
  committee: {
    all: ['committee'] as const,
    measures: () => ['committee', 'measures'] as const,
    chart: (key: string, params: Record<string, unknown>) => ['committee', 'chart', key, params] as const,
    gChart: (key: string, site: string) => ['committee', 'g-chart', key, site] as const,
    annotations: (site: string) => ['committee', 'annotations', site] as const,
    months: () => ['committee', 'months'] as const,
    month: (month: string) => ['committee', 'months', month] as const,
    packet: (month: string) => ['committee', 'packet', month] as const,
    reviews: () => ['committee', 'reviews'] as const,
    review: (month: string) => ['committee', 'reviews', month] as const,
    actions: (status: string) => ['committee', 'actions', status] as const,
    members: () => ['committee', 'members'] as const,
  },
  exports: {
    all: ['exports'] as const,
    variables: () => ['exports', 'variables'] as const,
    list: (scope: string) => ['exports', 'list', scope] as const,
    detail: (id: string) => ['exports', 'detail', id] as const,
    risk: (id: string) => ['exports', 'risk', id] as const,
    audit: (params: Record<string, unknown>) => ['exports', 'audit', params] as const,
  },
  quality: {
    all: ['quality'] as const,
    completeness: (params: Record<string, unknown>) => ['quality', 'completeness', params] as const,
    capture: (params: Record<string, unknown>) => ['quality', 'capture', params] as const,
    samples: () => ['quality', 'samples'] as const,
    abstractors: (siteIds: readonly string[]) => ['quality', 'abstractors', siteIds] as const,
    blind: (id: string) => ['quality', 'samples', id, 'blind'] as const,
    report: (id: string) => ['quality', 'samples', id, 'report'] as const,
    findings: (params: Record<string, unknown>) => ['quality', 'findings', params] as const,
  },
};
