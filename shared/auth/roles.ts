import { z } from 'zod';

export const RoleSchema = z.enum(['admin', 'abstractor', 'analyst', 'committee', 'researcher']);
export type Role = z.infer<typeof RoleSchema>;
export const ROLES = RoleSchema.options;

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  abstractor: 'Abstractor',
  analyst: 'Quality analyst',
  committee: 'Committee member',
  researcher: 'Researcher',
};

/** Who may call a route: anyone, any signed-in user, or any of the listed roles. */
export type Access = 'public' | 'signed-in' | readonly Role[] | { roles: readonly Role[]; chair?: boolean };
