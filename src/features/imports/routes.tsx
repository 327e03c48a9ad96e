import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { importPaths } from './paths.js';

// Lazy: the import pages carry the column lists and a table; the first page stays small.
const NewImportPage = lazy(() => import('./NewImportPage.js').then((m) => ({ default: m.NewImportPage })));
const ImportPage = lazy(() => import('./ImportPage.js').then((m) => ({ default: m.ImportPage })));
const HistoryPage = lazy(() => import('./HistoryPage.js').then((m) => ({ default: m.HistoryPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** Importing creates and changes cases: abstractors and admins (DESIGN.md role table). */
const IMPORTERS = ['admin', 'abstractor'] as const;

export const importsRoutes: FeatureRoute[] = [
  { path: importPaths.start, element: page(<NewImportPage />), roles: IMPORTERS, nav: { label: 'Import spreadsheet', group: 'Registry', order: 3 } },
  { path: importPaths.history, element: page(<HistoryPage />), roles: IMPORTERS, nav: { label: 'Import history', group: 'Registry', order: 4 } },
  { path: '/imports/:id', element: page(<ImportPage />), roles: IMPORTERS },
];
