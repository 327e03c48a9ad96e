import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

// Lazy: the research pages are used by few people; the first page stays small.
const RequestExportPage = lazy(() => import('./RequestExportPage.js').then((m) => ({ default: m.RequestExportPage })));
const MyExportsPage = lazy(() => import('./MyExportsPage.js').then((m) => ({ default: m.MyExportsPage })));
const ApprovalsPage = lazy(() => import('./ApprovalsPage.js').then((m) => ({ default: m.ApprovalsPage })));
const ExportAuditPage = lazy(() => import('./ExportAuditPage.js').then((m) => ({ default: m.ExportAuditPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** DESIGN.md role table: export requests — analysts and researchers request, admins approve. */
const REQUESTERS = ['analyst', 'researcher'] as const;

export const exportsRoutes: FeatureRoute[] = [
  { path: paths.research.exports, element: page(<MyExportsPage />), roles: REQUESTERS, nav: { label: 'My exports', group: 'Research', order: 1 } },
  { path: paths.research.request, element: page(<RequestExportPage />), roles: REQUESTERS, nav: { label: 'Request a dataset', group: 'Research', order: 2 } },
  { path: paths.research.approvals, element: page(<ApprovalsPage />), roles: ['admin'], nav: { label: 'Export approvals', group: 'Research', order: 3 } },
  { path: paths.research.audit, element: page(<ExportAuditPage />), roles: ['admin'], nav: { label: 'Export audit log', group: 'Research', order: 4 } },
];
