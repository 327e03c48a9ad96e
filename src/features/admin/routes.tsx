import type { FeatureRoute } from '../../app/feature.js';
import { paths } from '../../lib/paths.js';
import { UsersPage } from './UsersPage.js';
import { SitesPage } from './SitesPage.js';
import { MailboxPage } from './MailboxPage.js';

export const adminRoutes: FeatureRoute[] = [
  { path: paths.admin.users, element: <UsersPage />, roles: ['admin'], nav: { label: 'Users', group: 'Administration', order: 1 } },
  { path: paths.admin.sites, element: <SitesPage />, roles: ['admin'], nav: { label: 'Sites and units', group: 'Administration', order: 2 } },
  { path: paths.admin.mailbox, element: <MailboxPage />, roles: ['admin'], demoOnly: true, nav: { label: 'Demo mailbox', group: 'Administration', order: 9 } },
];
