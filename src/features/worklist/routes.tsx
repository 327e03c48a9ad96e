import { lazy, Suspense } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

const WorklistPage = lazy(() => import('./WorklistPage.js').then((m) => ({ default: m.WorklistPage })));

/** Abstractors work it; analysts verify from it (DESIGN.md: verify = admin, abstractor, analyst). */
export const worklistRoutes: FeatureRoute[] = [
  { path: paths.worklist, element: <Suspense fallback={<Loading what="the page" />}><WorklistPage /></Suspense>, roles: ['admin', 'abstractor', 'analyst'], nav: { label: 'Worklist', group: 'Registry', order: 3 } },
];
