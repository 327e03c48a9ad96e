import type { FeatureRoute } from './feature.js';
import { adminRoutes } from '../features/admin/routes.js';
import { HomePage } from '../features/home/HomePage.js';
import { AccountPage } from '../features/account/AccountPage.js';

/** Every feature's pages; each feature module adds its list here. */
export const featureRoutes: FeatureRoute[] = [
  { path: '/', element: <HomePage />, roles: 'signed-in', nav: { label: 'Home', group: 'Today', order: 0 } },
  { path: '/account', element: <AccountPage />, roles: 'signed-in' },
  ...adminRoutes,
];
