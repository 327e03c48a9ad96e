/**
 * SQL for an export: one row per case of the cohort with the chosen variables as raw values
 * (the de-identification itself is applied per row by transform.ts), in random order so that
 * the row order tells nothing about dates or registry numbers.
 */
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { CLAVIEN_DINDO_GRADES, PPC_EVENT_TYPES, THERAPY_MODALITIES } from '../../shared/clinical/codes.js';
import type { CaseFieldName } from '../../shared/registry/case.js';
import { K_THRESHOLD, type QuasiIdentifier } from '../../shared/exports/k-anonymity.js';
import type { ExportVariable } from '../../shared/exports/variables.js';
import { CASE_COLUMNS } from '../registry/columns.js';
import { cohortCaseIds, cohortFrom, SqlParams } from './cohort.js';
import { factConditions } from '../analysis/cohort-sql.js';

const factConditionsFor = (cohort: CohortFilter, p: SqlParams) => factConditions(cohort, 'f', { params: p }).join(' AND ');

/** Age band width used by the k-anonymity check, and after coarsening. */
export const AGE_BAND_YEARS = { normal: 10, coarse: 20 } as const;

const DAY_COLUMNS: Record<string, string> = {
  admissionDate: 'admission_date', dischargeDate: 'discharge_date', deathDate: 'death_date', followUpCompletedOn: 'follow_up_completed_on',
};

/** The SQL expression giving a variable's raw value. */
export function variableSql(v: ExportVariable): string {
  const s = v.source;
  switch (s.kind) {
    case 'case': {
      if (s.field === 'ariscatPoints') return 'c.ariscat_points';
      const col = CASE_COLUMNS[s.field as CaseFieldName];
      if (!col) throw new Error(`export variable ${v.name} has no registry column`);
      return col.kind === 'numeric' ? `c.${col.column}::float8` : `c.${col.column}`;
    }
    case 'derived':
      switch (s.rule) {
        case 'site': return 'c.site_id';
        case 'unit': return 'c.unit_id';
        case 'surgeryPeriod': return `to_char(c.surgery_date, 'YYYY-MM')`;
        case 'age':
        case 'ageBand': return 'c.age';
        case 'daysFromSurgery': return `(c.${DAY_COLUMNS[s.field]} - c.surgery_date)`;
      }
      break;
    case 'ppc': {
      const i = PPC_EVENT_TYPES.indexOf(s.type as never);
      return s.what === 'present' ? `coalesce(o.p${i}, false)` : `o.d${i}`;
    }
    case 'ppcWorstGrade': return 'o.worst';
    case 'therapy': {
      const i = THERAPY_MODALITIES.indexOf(s.modality as never);
      return s.what === 'given' ? `coalesce(t.g${i}, false)` : s.what === 'startDay' ? `t.s${i}` : `t.n${i}`;
    }
  }
  throw new Error(`export variable ${v.name} has an unknown source`);
}

const lit = (p: SqlParams, v: string) => `${p.add(v)}::text`;

function outcomeLateral(p: SqlParams): string {
  const cols = PPC_EVENT_TYPES.flatMap((type, i) => {
    const t = lit(p, type);
    return [`bool_or(e.type = ${t}) AS p${i}`, `min(e.onset_postoperative_day) FILTER (WHERE e.type = ${t})::int AS d${i}`];
  });
  cols.push(`max(array_position(${p.add([...CLAVIEN_DINDO_GRADES])}::text[], e.clavien_dindo)) AS worst`);
  return `LEFT JOIN LATERAL (SELECT ${cols.join(', ')} FROM outcome_events e WHERE e.case_id = c.id AND e.removed_at IS NULL) o ON true`;
}

function therapyLateral(p: SqlParams): string {
  const cols = THERAPY_MODALITIES.flatMap((m, i) => {
    const t = lit(p, m);
    return [`bool_or(e.modality = ${t}) AS g${i}`, `min(e.start_postoperative_day) FILTER (WHERE e.modality = ${t})::int AS s${i}`, `sum(e.sessions_delivered) FILTER (WHERE e.modality = ${t})::int AS n${i}`];
  });
  return `LEFT JOIN LATERAL (SELECT ${cols.join(', ')} FROM therapy_episodes e WHERE e.case_id = c.id AND e.removed_at IS NULL) t ON true`;
}

function outcomeJoin(p: SqlParams, restrict: string): string {
  const cols = PPC_EVENT_TYPES.flatMap((type, i) => {
    const t = lit(p, type);
    return [`bool_or(e.type = ${t}) AS p${i}`, `min(e.onset_postoperative_day) FILTER (WHERE e.type = ${t})::int AS d${i}`];
  });
  cols.push(`max(array_position(${p.add([...CLAVIEN_DINDO_GRADES])}::text[], e.clavien_dindo)) AS worst`);
  return `LEFT JOIN (SELECT e.case_id, ${cols.join(', ')} FROM outcome_events e WHERE e.removed_at IS NULL AND ${restrict} GROUP BY e.case_id) o ON o.case_id = c.id`;
}

function therapyJoin(p: SqlParams, restrict: string): string {
  const cols = THERAPY_MODALITIES.flatMap((m, i) => {
    const t = lit(p, m);
    return [`bool_or(e.modality = ${t}) AS g${i}`, `min(e.start_postoperative_day) FILTER (WHERE e.modality = ${t})::int AS s${i}`, `sum(e.sessions_delivered) FILTER (WHERE e.modality = ${t})::int AS n${i}`];
  });
  return `LEFT JOIN (SELECT e.case_id, ${cols.join(', ')} FROM therapy_episodes e WHERE e.removed_at IS NULL AND ${restrict} GROUP BY e.case_id) t ON t.case_id = c.id`;
}

/** The quasi-identifiers present in an export (only those the file carries can re-identify). */
export function quasiIdentifiersOf(variables: readonly ExportVariable[]): QuasiIdentifier[] {
  const names = new Set(variables.map((v) => v.name));
  const out: QuasiIdentifier[] = [];
  if (names.has('age') || names.has('ageBand')) out.push('ageBand');
  if (names.has('sex')) out.push('sex');
  if (names.has('site')) out.push('siteCode');
  if (names.has('surgeryPeriod')) out.push('surgeryYear');
  if (names.has('procedureCategory')) out.push('procedureCategory');
  return out;
}

/** SQL of one quasi-identifier (site codes are one-to-one with site ids within an export). */
export function quasiIdentifierSql(q: QuasiIdentifier, coarse: boolean, level: 'deidentified' | 'limited'): string {
  const w = coarse ? AGE_BAND_YEARS.coarse : AGE_BAND_YEARS.normal;
  switch (q) {
    case 'ageBand': return `CASE WHEN c.age >= 90 THEN 90 ELSE (c.age / ${w}) * ${w} END`;
    case 'sex': return 'c.sex';
    case 'siteCode': return 'c.site_id';
    case 'surgeryYear': return level === 'limited' && !coarse ? `to_char(c.surgery_date, 'YYYY-MM')` : `extract(year FROM c.surgery_date)::int`;
    case 'procedureCategory': return 'c.procedure_category';
  }
}

export interface ExportQueryInput {
  cohort: CohortFilter;
  variables: readonly ExportVariable[];
  level: 'deidentified' | 'limited';
  coarsen: boolean;
  /** Leave out records in equivalence classes smaller than K_THRESHOLD. */
  suppress: boolean;
}

/** The row query: columns v0..vN in the order of `variables`. */
export function exportRowsSql(input: ExportQueryInput): { sql: string; params: unknown[] } {
  const p = new SqlParams();
  const { from, where } = cohortFrom(input.cohort, p);
  const needsOutcomes = input.variables.some((v) => v.source.kind === 'ppc' || v.source.kind === 'ppcWorstGrade');
  const needsTherapy = input.variables.some((v) => v.source.kind === 'therapy');
  // The per-case summaries aggregate only the cohort's events and episodes, not the whole table.
  const inCohort = () => `e.case_id IN (${cohortCaseIds(input.cohort, p)})`;
  const joins = [needsOutcomes ? outcomeJoin(p, inCohort()) : '', needsTherapy ? therapyJoin(p, inCohort()) : ''].filter(Boolean).join(' ');
  const cols = input.variables.map((v, i) => `${variableSql(v)} AS v${i}`);
  const qis = quasiIdentifiersOf(input.variables);
  const base = `FROM ${from} ${joins} WHERE ${where.join(' AND ')}`;
  if (input.suppress && qis.length) {
    const part = qis.map((q) => quasiIdentifierSql(q, input.coarsen, input.level)).join(', ');
    const outer = input.variables.map((_, i) => `x.v${i}`).join(', ');
    return { sql: `SELECT ${outer} FROM (SELECT ${cols.join(', ')}, count(*) OVER (PARTITION BY ${part}) AS k_class ${base}) x WHERE x.k_class >= ${K_THRESHOLD} ORDER BY random()`, params: p.values };
  }
  // Random order without sorting the wide rows: the cohort's ids are shuffled (a narrow sort),
  // then each case and its summaries are looked up by index in that order; under a cursor's
  // fast-start plan the rows stream from the first moment (measured: first rows after 0.4 s
  // instead of 3-5 s for 200,000 cases, tests/bench/exports.bench.ts).
  const q = new SqlParams();
  const ids = `SELECT f.case_id, random() AS r FROM analysis_case_facts f WHERE ${factConditionsFor(input.cohort, q)} ORDER BY 2`;
  const lateral = [needsOutcomes ? outcomeLateral(q) : '', needsTherapy ? therapyLateral(q) : ''].filter(Boolean).join(' ');
  return { sql: `SELECT ${cols.join(', ')} FROM (${ids}) ids JOIN surgical_cases c ON c.id = ids.case_id ${lateral} ORDER BY ids.r`, params: q.values };
}

/** Sizes of the equivalence classes over the export's quasi-identifiers. */
export function classSizesSql(input: Omit<ExportQueryInput, 'suppress'>): { sql: string; params: unknown[]; quasiIdentifiers: QuasiIdentifier[] } {
  const p = new SqlParams();
  const { from, where } = cohortFrom(input.cohort, p);
  const qis = quasiIdentifiersOf(input.variables);
  const group = qis.length ? `GROUP BY ${qis.map((q) => quasiIdentifierSql(q, input.coarsen, input.level)).join(', ')}` : '';
  return { sql: `SELECT count(*)::int AS n FROM ${from} WHERE ${where.join(' AND ')} ${group}`, params: p.values, quasiIdentifiers: qis };
}

/** Number of cases in the cohort (after suppression when asked). */
export function countSql(input: ExportQueryInput): { sql: string; params: unknown[] } {
  const p = new SqlParams();
  const { from, where } = cohortFrom(input.cohort, p);
  const qis = quasiIdentifiersOf(input.variables);
  if (input.suppress && qis.length) {
    const part = qis.map((q) => quasiIdentifierSql(q, input.coarsen, input.level)).join(', ');
    return { sql: `SELECT coalesce(sum(n) FILTER (WHERE n >= ${K_THRESHOLD}), 0)::int AS n FROM (SELECT count(*) AS n FROM ${from} WHERE ${where.join(' AND ')} GROUP BY ${part}) g`, params: p.values };
  }
  return { sql: `SELECT count(*)::int AS n FROM ${from} WHERE ${where.join(' AND ')}`, params: p.values };
}
