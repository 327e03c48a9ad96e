import type { ReactNode } from 'react';
import type { Role } from '../../shared/auth/roles.js';

/** A page a feature contributes: its path, who may open it, and where it sits in the navigation. */
export interface FeatureRoute {
  path: string;
  element: ReactNode;
  roles: readonly Role[] | 'signed-in';
  chair?: boolean;
  demoOnly?: boolean;
  nav?: { label: string; group: NavGroup; order: number };
}
export type NavGroup = 'Today' | 'Registry' | 'Analysis' | 'Committee' | 'Research' | 'Data quality' | 'Administration';
export const NAV_GROUPS: NavGroup[] = ['Today', 'Registry', 'Analysis', 'Committee', 'Research', 'Data quality', 'Administration'];
