import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';

// Lazy: recharts and the committee pages load only when opened.
const ChartsPage = lazy(() => import('./ChartsPage.js').then((m) => ({ default: m.ChartsPage })));
const MeasuresPage = lazy(() => import('./MeasuresPage.js').then((m) => ({ default: m.MeasuresPage })));
const MeasureDefinitionPage = lazy(() => import('./MeasuresPage.js').then((m) => ({ default: m.MeasureDefinitionPage })));
const MonthClosePage = lazy(() => import('./MonthClosePage.js').then((m) => ({ default: m.MonthClosePage })));
const ReviewsPage = lazy(() => import('./ReviewPage.js').then((m) => ({ default: m.ReviewsPage })));
const ReviewPage = lazy(() => import('./ReviewPage.js').then((m) => ({ default: m.ReviewPage })));
const PacketPage = lazy(() => import('./PacketPage.js').then((m) => ({ default: m.PacketPage })));
const PrintPage = lazy(() => import('./PrintPage.js').then((m) => ({ default: m.PrintPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** Network aggregates with site names: admins, analysts and the committee (DESIGN.md). */
const READERS = ['admin', 'analyst', 'committee'] as const;

export const committeeRoutes: FeatureRoute[] = [
  { path: '/committee/charts', element: page(<ChartsPage />), roles: READERS, nav: { label: 'Measure charts', group: 'Committee', order: 1 } },
  { path: '/committee/reviews', element: page(<ReviewsPage />), roles: READERS, nav: { label: 'Reviews and actions', group: 'Committee', order: 2 } },
  { path: '/committee/months', element: page(<MonthClosePage />), roles: READERS, nav: { label: 'Month close', group: 'Committee', order: 3 } },
  { path: '/committee/measures', element: page(<MeasuresPage />), roles: READERS, nav: { label: 'Measures', group: 'Committee', order: 4 } },
  { path: '/committee/measures/:key', element: page(<MeasureDefinitionPage />), roles: READERS },
  { path: '/committee/reviews/:month', element: page(<ReviewPage />), roles: READERS },
  { path: '/committee/packet/:month', element: page(<PacketPage />), roles: READERS },
  { path: '/committee/packet/:month/print', element: page(<PrintPage />), roles: READERS },
];
