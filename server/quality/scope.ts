/** Which sites a quality query covers: the asked sites within the user's scope, or all of it. */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { caseSiteScope } from '../http/scope.js';
import { badRequest } from '../http/errors.js';

export interface SiteRef { id: string; code: string }

export async function scopedSites(ds: DataSource, user: SessionUser, asked: readonly string[] | undefined): Promise<SiteRef[]> {
  const scope = caseSiteScope(user);
  if (asked) {
    const outside = scope ? asked.filter((s) => !scope.includes(s)) : [];
    // Another site's id is answered as unknown, so its existence is not revealed.
    if (outside.length) throw badRequest('a chosen site is not one of your sites', 'choose among the sites you are assigned to', [{ path: 'siteId', message: 'is not one of your sites' }]);
  }
  const ids = asked ?? scope;
  const rows: SiteRef[] = await ds.query(`SELECT id, code FROM sites WHERE ($1::uuid[] IS NULL OR id = ANY($1)) ORDER BY code`, [ids]);
  if (asked && rows.length !== new Set(asked).size) throw badRequest('a chosen site does not exist', 'choose among the sites listed', [{ path: 'siteId', message: 'is not a known site' }]);
  return rows;
}
