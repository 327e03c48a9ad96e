/**
 * Turns a CohortFilter into parameterised SQL over the analysis tables (server/analysis/facts.ts):
 * every value travels as a bind parameter ($1, $2 ...), never inside the SQL text; only
 * column names and integer codes/bitmasks computed here from closed lists are written in.
 *
 * Only statuses that count in analyses (complete, verified, locked) are ever included.
 *
 * `cohortCells` answers with rows of one shape, the "cell": key columns (site_id, month,
 * status, ariscat, incision, therapy) and summed measures (n, one column per outcome flag,
 * discharged, patient_days, pneumonia_discharged). When the filter uses only the roll-up's
 * dimensions (dates, sites, statuses, ARISCAT class, incision site, therapy received), the
 * months wholly inside the date range come from the roll-up `analysis_cells` and only the
 * partial months at either end from the fact table; otherwise every row comes from the
 * narrow fact table. Callers aggregate cells with SUM, whichever source answered.
 */
import {
  ADHERENCE_BANDS,
  AGE_BANDS,
  ANALYSED_STATUSES,
  type CohortFilter,
} from '../../shared/analysis/cohort-filter.js';
import {
  APPROACH_CODES,
  ARISCAT_CODES,
  ASA_CODES,
  CATEGORY_CODES,
  EVENT_TYPE_BITS,
  INCISION_CODES,
  MODALITY_BITS,
  OUTCOME_COLUMNS,
  OUTCOME_FLAGS,
  SEX_CODES,
  STATUS_CODES,
  URGENCY_CODES,
  bitmaskOf,
  codeOf,
} from './facts.js';

/** Collects bind parameters; `add` returns the placeholder. */
export class SqlParams {
  readonly values: unknown[] = [];
  add(value: unknown): string {
    this.values.push(value);
    return `$${this.values.length}`;
  }
}

export interface CohortSqlOptions {
  params: SqlParams;
  /** Limit to these sites (a user's own sites); null/undefined = no limit. */
  restrictSites?: readonly string[] | null;
}

/** Filter fields the roll-up can answer (besides exact month boundaries). */
const ROLLUP_FIELDS = new Set<keyof CohortFilter>(['from', 'to', 'sites', 'statuses', 'ariscatClasses', 'incisionSites', 'therapy']);

export function usesOnlyRollupDimensions(filter: CohortFilter): boolean {
  return (Object.keys(filter) as (keyof CohortFilter)[]).every((k) => {
    const v = filter[k];
    return v == null || (Array.isArray(v) && v.length === 0) || ROLLUP_FIELDS.has(k);
  });
}

const codes = (list: readonly string[], values: readonly string[]) => values.map((v) => codeOf(list, v));
const nonEmpty = <T>(v: readonly T[] | undefined): v is readonly T[] => Array.isArray(v) && v.length > 0;

/** Status codes counted: the analysed statuses, narrowed by the filter. */
export function countedStatusCodes(filter: CohortFilter): number[] {
  const wanted = nonEmpty(filter.statuses) ? filter.statuses : ANALYSED_STATUSES;
  return codes(STATUS_CODES, wanted.filter((s) => (ANALYSED_STATUSES as readonly string[]).includes(s)));
}

/** Conditions shared by the fact table and the roll-up (columns with the same names). */
function commonConditions(filter: CohortFilter, alias: string, opts: CohortSqlOptions): string[] {
  const p = opts.params;
  const c: string[] = [`${alias}.status = ANY(${p.add(countedStatusCodes(filter))}::smallint[])`];
  if (nonEmpty(filter.sites)) c.push(`${alias}.site_id = ANY(${p.add(filter.sites)}::uuid[])`);
  if (opts.restrictSites) c.push(`${alias}.site_id = ANY(${p.add(opts.restrictSites)}::uuid[])`);
  const col = (name: string) => `${alias}.${name}`;
  if (nonEmpty(filter.ariscatClasses)) c.push(`${col('ariscat')} = ANY(${p.add(codes(ARISCAT_CODES, filter.ariscatClasses))}::smallint[])`);
  if (nonEmpty(filter.incisionSites)) c.push(`${col('incision')} = ANY(${p.add(codes(INCISION_CODES, filter.incisionSites))}::smallint[])`);
  if (filter.therapy) c.push(filter.therapy === 'yes' ? `${alias}.therapy` : `NOT ${alias}.therapy`);
  return c;
}

/** WHERE conditions on `analysis_case_facts` for the whole filter (joined with AND). */
export function factConditions(filter: CohortFilter, alias: string, opts: CohortSqlOptions): string[] {
  const p = opts.params;
  const c = commonConditions(filter, alias, opts);
  if (filter.from) c.push(`${alias}.surgery_date >= ${p.add(filter.from)}::date`);
  if (filter.to) c.push(`${alias}.surgery_date <= ${p.add(filter.to)}::date`);
  if (nonEmpty(filter.units)) c.push(`${alias}.unit_id = ANY(${p.add(filter.units)}::uuid[])`);
  const inCodes = (column: string, list: readonly string[], values: readonly string[] | undefined) => {
    if (nonEmpty(values)) c.push(`${alias}.${column} = ANY(${p.add(codes(list, values))}::smallint[])`);
  };
  inCodes('category', CATEGORY_CODES, filter.procedureCategories);
  inCodes('approach', APPROACH_CODES, filter.approaches);
  inCodes('urgency', URGENCY_CODES, filter.urgencies);
  inCodes('asa', ASA_CODES, filter.asaClasses);
  inCodes('sex', SEX_CODES, filter.sexes);
  if (nonEmpty(filter.ageBands)) {
    const ors = filter.ageBands.map((b) => {
      const band = AGE_BANDS[b];
      return band.max == null ? `${alias}.age >= ${p.add(band.min)}::int` : `${alias}.age BETWEEN ${p.add(band.min)}::int AND ${p.add(band.max)}::int`;
    });
    c.push(`(${ors.join(' OR ')})`);
  }
  if (nonEmpty(filter.modalities)) c.push(`(${alias}.modalities & ${p.add(bitmaskOf(MODALITY_BITS, filter.modalities))}::int) <> 0`);
  if (filter.firstTherapyMin != null) c.push(`${alias}.first_therapy_day >= ${p.add(filter.firstTherapyMin)}::int`);
  if (filter.firstTherapyMax != null) c.push(`${alias}.first_therapy_day <= ${p.add(filter.firstTherapyMax)}::int`);
  if (nonEmpty(filter.adherenceBands)) {
    const ors = filter.adherenceBands.map((b) => {
      const band = ADHERENCE_BANDS[b];
      return band.below == null ? `${alias}.adherence >= ${p.add(band.min)}::real` : `(${alias}.adherence >= ${p.add(band.min)}::real AND ${alias}.adherence < ${p.add(band.below)}::real)`;
    });
    c.push(`(${ors.join(' OR ')})`);
  }
  if (nonEmpty(filter.outcomeTypes)) c.push(`(${alias}.event_types & ${p.add(bitmaskOf(EVENT_TYPE_BITS, filter.outcomeTypes))}::int) <> 0`);
  return c;
}

/** Summed measure columns of a cell, in order. */
export const CELL_MEASURES = ['n', ...OUTCOME_FLAGS.map((f) => OUTCOME_COLUMNS[f].cell), 'discharged', 'patient_days', 'pneumonia_discharged'] as const;
const CELL_KEYS = ['site_id', 'month', 'status', 'ariscat', 'incision', 'therapy'] as const;

function factAsCell(alias: string): string {
  const flags = OUTCOME_FLAGS.map((f) => `${OUTCOME_COLUMNS[f].fact(alias)}::int AS ${OUTCOME_COLUMNS[f].cell}`);
  return [
    `${alias}.site_id`, `${alias}.month`, `${alias}.status`, `coalesce(${alias}.ariscat, 0)::smallint AS ariscat`,
    `coalesce(${alias}.incision, 0)::smallint AS incision`, `${alias}.therapy`, '1 AS n', ...flags,
    `(${alias}.patient_days IS NOT NULL)::int AS discharged`, `coalesce(${alias}.patient_days, 0) AS patient_days`,
    `(${alias}.pneumonia AND ${alias}.patient_days IS NOT NULL)::int AS pneumonia_discharged`,
  ].join(', ');
}

function firstOfMonth(d: string): string {
  return `${d.slice(0, 7)}-01`;
}
function addMonths(monthStart: string, k: number): string {
  const [y, m] = monthStart.split('-').map(Number);
  const t = y * 12 + (m - 1) + k;
  return `${Math.floor(t / 12)}-${String((t % 12) + 1).padStart(2, '0')}-01`;
}
function isLastDayOfMonth(d: string): boolean {
  const next = new Date(`${d}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return next.getUTCDate() === 1;
}

/** The months wholly inside [from, to] (null bound = open). */
export function wholeMonths(from?: string, to?: string): { first: string | null; last: string | null } {
  const first = from ? (from.endsWith('-01') ? firstOfMonth(from) : addMonths(firstOfMonth(from), 1)) : null;
  const last = to ? (isLastDayOfMonth(to) ? firstOfMonth(to) : addMonths(firstOfMonth(to), -1)) : null;
  return { first, last };
}

/**
 * A subquery (to be used as `FROM (...) c`) giving the cohort's cells.
 * @param los when true, the cells also carry `los` (length of stay in days) and only `n`
 *   (source: analysis_los_cells / the fact table), for frequency tables.
 */
export function cohortCells(filter: CohortFilter, opts: CohortSqlOptions & { los?: boolean }): string {
  const measures = opts.los ? ['n'] : [...CELL_MEASURES];
  const keys = opts.los ? [...CELL_KEYS, 'los'] : [...CELL_KEYS];
  const factSelect = (where: string[]) =>
    opts.los
      ? `SELECT f.site_id, f.month, f.status, coalesce(f.ariscat, 0)::smallint AS ariscat, coalesce(f.incision, 0)::smallint AS incision, f.therapy, f.los, 1 AS n FROM analysis_case_facts f WHERE ${where.join(' AND ')}`
      : `SELECT ${factAsCell('f')} FROM analysis_case_facts f WHERE ${where.join(' AND ')}`;

  if (!usesOnlyRollupDimensions(filter)) return factSelect(factConditions(filter, 'f', opts));

  const p = opts.params;
  const { first, last } = wholeMonths(filter.from, filter.to);
  if (first && last && first > last) return factSelect(factConditions(filter, 'f', opts));
  const table = opts.los ? 'analysis_los_cells' : 'analysis_cells';
  const cellWhere = commonConditions(filter, 'r', opts);
  if (first) cellWhere.push(`r.month >= ${p.add(first)}::date`);
  if (last) cellWhere.push(`r.month <= ${p.add(last)}::date`);
  const rollup = `SELECT ${[...keys.map((k) => `r.${k}`), ...measures.map((m) => `r.${m}`)].join(', ')} FROM ${table} r WHERE ${cellWhere.join(' AND ')}`;
  // Partial months at the edges: only the fact rows of those months.
  const edges: string[] = [];
  if (filter.from && first !== firstOfMonth(filter.from)) edges.push(`f.month = ${p.add(firstOfMonth(filter.from))}::date`);
  if (filter.to && last !== firstOfMonth(filter.to)) edges.push(`f.month = ${p.add(firstOfMonth(filter.to))}::date`);
  if (!edges.length) return rollup;
  const factWhere = [...factConditions(filter, 'f', opts), `(${edges.join(' OR ')})`];
  return `${rollup} UNION ALL ${factSelect(factWhere)}`;
}
