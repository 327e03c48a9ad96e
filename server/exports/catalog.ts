import { buildDictionary } from '../../shared/registry/dictionary.js';
import { exportCatalog, AGGREGATE_DIMENSIONS, type ExportVariable } from '../../shared/exports/variables.js';
import { badRequest } from '../http/errors.js';

let cached: ExportVariable[] | null = null;
/** The export catalog of the registry's current dictionary (default-deny; see shared/exports/variables.ts). */
export function currentCatalog(): ExportVariable[] {
  cached ??= exportCatalog(buildDictionary());
  return cached;
}

/** Resolves requested variable names against the catalog; an unknown or non-exportable name is a 400 naming it. */
export function resolveVariables(names: readonly string[], path: string, catalog = currentCatalog()): ExportVariable[] {
  const byName = new Map(catalog.map((v) => [v.name, v]));
  const bad = names.map((n, i) => ({ n, i })).filter(({ n }) => !byName.has(n));
  if (bad.length) {
    throw badRequest(
      `${bad.length} requested field${bad.length === 1 ? ' is' : 's are'} not exportable: ${bad.map((b) => b.n).join(', ')}`,
      'choose fields from the list of exportable variables (GET /api/exports/variables); free text and fields the data dictionary does not mark exportable never leave',
      bad.map((b) => ({ path: `${path}.${b.i}`, message: `${b.n} is not an exportable variable` })),
    );
  }
  // Keep catalog order, once each.
  const wanted = new Set(names);
  return catalog.filter((v) => wanted.has(v.name));
}

export function resolveDimension(name: string | undefined, path: string, catalog = currentCatalog()): ExportVariable | null {
  if (!name) return null;
  const v = catalog.find((x) => x.name === name);
  if (!v || !(AGGREGATE_DIMENSIONS as readonly string[]).includes(name)) {
    throw badRequest(`${name} cannot break down an aggregate table`, `choose one of: ${AGGREGATE_DIMENSIONS.filter((d) => catalog.some((c) => c.name === d)).join(', ')}`, [{ path, message: 'not an aggregate dimension' }]);
  }
  return v;
}
