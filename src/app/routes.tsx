import type { FeatureRoute } from './feature.js';
import { adminRoutes } from '../features/admin/routes.js';
import { HomePage } from '../features/home/HomePage.js';
import { AccountPage } from '../features/account/AccountPage.js';
import { casesRoutes } from '../features/cases/routes.js';
import { importsRoutes } from '../features/imports/routes.js';
import { worklistRoutes } from '../features/worklist/routes.js';
import { dictionaryRoutes } from '../features/dictionary/routes.js';
import { committeeRoutes } from '../features/committee/routes.js';
import { exportsRoutes } from '../features/exports/routes.js';
import { cohortsRoutes } from '../features/cohorts/routes.js';
import { qualityRoutes } from '../features/quality/routes.js';

/** Every feature's pages; each feature module adds its list here. */
export const featureRoutes: FeatureRoute[] = [
  { path: '/', element: <HomePage />, roles: 'signed-in', nav: { label: 'Home', group: 'Today', order: 0 } },
  { path: '/account', element: <AccountPage />, roles: 'signed-in' },
  ...adminRoutes,
  ...casesRoutes,
  ...importsRoutes,
  ...worklistRoutes,
  ...dictionaryRoutes,
  ...committeeRoutes,
  ...exportsRoutes,
  ...cohortsRoutes,
  ...qualityRoutes,
];
