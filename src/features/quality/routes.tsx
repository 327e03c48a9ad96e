import { lazy, Suspense, type ReactNode } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

// Lazy: the chart library and the report tables load only on these pages.
const DataQualityPage = lazy(() => import('./DataQualityPage.js').then((m) => ({ default: m.DataQualityPage })));
const CapturePage = lazy(() => import('./CapturePage.js').then((m) => ({ default: m.CapturePage })));
const ReabstractionPage = lazy(() => import('./ReabstractionPage.js').then((m) => ({ default: m.ReabstractionPage })));
const BlindEntryPage = lazy(() => import('./BlindEntryPage.js').then((m) => ({ default: m.BlindEntryPage })));
const AgreementReportPage = lazy(() => import('./AgreementReportPage.js').then((m) => ({ default: m.AgreementReportPage })));
const FindingsPage = lazy(() => import('./FindingsPage.js').then((m) => ({ default: m.FindingsPage })));

const page = (el: ReactNode) => <Suspense fallback={<Loading what="the page" />}>{el}</Suspense>;
/** Same roles as the server routes (server/quality/quality.router.ts). */
const READERS = ['admin', 'abstractor', 'analyst', 'committee'] as const;
const STAFF = ['admin', 'abstractor', 'analyst'] as const;

export const qualityRoutes: FeatureRoute[] = [
  { path: paths.quality.completeness, element: page(<DataQualityPage />), roles: READERS, nav: { label: 'Completeness', group: 'Data quality', order: 1 } },
  { path: paths.quality.capture, element: page(<CapturePage />), roles: READERS, nav: { label: 'Case capture', group: 'Data quality', order: 2 } },
  { path: paths.quality.reabstraction, element: page(<ReabstractionPage />), roles: STAFF, nav: { label: 'Re-abstraction', group: 'Data quality', order: 3 } },
  { path: '/quality/reabstraction/:id/entry', element: page(<BlindEntryPage />), roles: ['admin', 'abstractor'] },
  { path: '/quality/reabstraction/:id/report', element: page(<AgreementReportPage />), roles: STAFF },
  { path: paths.quality.findings, element: page(<FindingsPage />), roles: STAFF, nav: { label: 'Consistency findings', group: 'Data quality', order: 4 } },
];
