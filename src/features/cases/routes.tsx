import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

// Lazy: the form pulls in the schemas and definition functions; the first page stays small.
const CaseListPage = lazy(() => import('./CaseListPage.js').then((m) => ({ default: m.CaseListPage })));
const NewCasePage = lazy(() => import('./CaseFormPage.js').then((m) => ({ default: m.NewCasePage })));
const EditCasePage = lazy(() => import('./CaseFormPage.js').then((m) => ({ default: m.EditCasePage })));
const CaseDetailPage = lazy(() => import('./CaseDetailPage.js').then((m) => ({ default: m.CaseDetailPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** Case-level rows: never researchers (DESIGN.md role table). */
const READERS = ['admin', 'abstractor', 'analyst', 'committee'] as const;
const EDITORS = ['admin', 'abstractor'] as const;

export const casesRoutes: FeatureRoute[] = [
  { path: paths.cases.list, element: page(<CaseListPage />), roles: READERS, nav: { label: 'Cases', group: 'Registry', order: 1 } },
  { path: paths.cases.create, element: page(<NewCasePage />), roles: EDITORS, nav: { label: 'New case', group: 'Registry', order: 2 } },
  { path: '/cases/:id', element: page(<CaseDetailPage />), roles: READERS },
  { path: '/cases/:id/edit', element: page(<EditCasePage />), roles: EDITORS },
];
