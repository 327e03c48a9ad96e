import type { SessionUser } from '../../shared/auth/user.js';
import { notFound } from './errors.js';

/** Site ids whose case-level rows the user may see; null means every site (admins). */
export function caseSiteScope(user: SessionUser): string[] | null {
  return user.roles.includes('admin') ? null : user.siteIds;
}

/**
 * Refuses access to another site's case-level data. Answers 404, not 403, so that the
 * existence of a case at another site is not revealed (OWASP ASVS 4.0.3 V4.2.1).
 */
export function assertSiteAccess(user: SessionUser, siteId: string, what = 'the case'): void {
  const scope = caseSiteScope(user);
  if (scope && !scope.includes(siteId)) throw notFound(what);
}
