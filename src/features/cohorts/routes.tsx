import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

// Lazy: the charts (recharts) load only with these pages.
const CohortBuilderPage = lazy(() => import('./CohortBuilderPage.js').then((m) => ({ default: m.CohortBuilderPage })));
const ComparePage = lazy(() => import('./ComparePage.js').then((m) => ({ default: m.ComparePage })));
const FunnelPage = lazy(() => import('./FunnelPage.js').then((m) => ({ default: m.FunnelPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** Cohorts and comparisons: every role (researchers see aggregates only, suppressed; DESIGN.md). */
const ANALYSTS = ['admin', 'abstractor', 'analyst', 'committee', 'researcher'] as const;

export const cohortsRoutes: FeatureRoute[] = [
  { path: paths.cohorts.builder, element: page(<CohortBuilderPage />), roles: ANALYSTS, nav: { label: 'Cohorts', group: 'Analysis', order: 1 } },
  { path: paths.cohorts.compare, element: page(<ComparePage />), roles: ANALYSTS, nav: { label: 'Compare cohorts', group: 'Analysis', order: 2 } },
  { path: paths.cohorts.funnel, element: page(<FunnelPage />), roles: ANALYSTS, nav: { label: 'Site funnel', group: 'Analysis', order: 3 } },
];
