/**
 * Who sees what in an aggregate (DESIGN.md, roles at a glance): administrators, analysts and
 * committee members see network aggregates with site names; abstractors see network totals
 * beside their own sites (no other site named or shown on its own); researchers see aggregates
 * only, with counts of 1 to 10 suppressed (suppressSmallCells, CMS cell-size policy) and sites coded.
 */
import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { poolRows } from '../db/pool-rows.js';
import type { SessionUser } from '../../shared/auth/user.js';
import type { SiteVisibility } from '../../shared/analysis/results.js';

export interface Viewer {
  visibility: SiteVisibility;
  /** Small cells hidden (researchers). */
  suppress: boolean;
  ownSites: readonly string[];
  userId: string;
  email: string;
}

export function viewerOf(user: SessionUser): Viewer {
  const named = user.roles.some((r) => r === 'admin' || r === 'analyst' || r === 'committee');
  const visibility: SiteVisibility = named ? 'named' : user.roles.includes('abstractor') ? 'own-sites' : 'coded';
  return { visibility, suppress: visibility === 'coded', ownSites: user.siteIds ?? [], userId: user.id, email: user.email };
}

export interface SiteLabel { id: string; label: string; key: string }

/**
 * Labels of the network's sites for this viewer. Coded labels ("Site 1", "Site 2", ...) follow
 * the order of a hash of the site id, so they are stable but reveal neither code nor name.
 */
export async function siteLabels(ds: DataSource, viewer: Viewer): Promise<Map<string, SiteLabel>> {
  const rows = await poolRows<{ id: string; code: string; name: string }>(ds, `SELECT id::text AS id, code, name FROM sites ORDER BY code`);
  const map = new Map<string, SiteLabel>();
  if (viewer.visibility === 'coded') {
    const order = [...rows].sort((a, b) => hash(a.id).localeCompare(hash(b.id)));
    order.forEach((r, i) => map.set(r.id, { id: r.id, label: `Site ${i + 1}`, key: `site-${i + 1}` }));
  } else rows.forEach((r) => map.set(r.id, { id: r.id, label: `${r.code} — ${r.name}`, key: r.code }));
  return map;
}

function hash(s: string): string {
  return createHash('sha256').update(`alveolog-site-code:${s}`).digest('hex');
}

/** Whether one site's own row may be shown to this viewer. */
export function mayShowSite(viewer: Viewer, siteId: string): boolean {
  return viewer.visibility !== 'own-sites' || viewer.ownSites.includes(siteId);
}
