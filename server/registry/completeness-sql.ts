/**
 * The one completeness query, as SQL generated from the rules in shared/registry/completeness.ts:
 * the view `case_completeness` (created by the Registry migration from this text) lists, per
 * case, the missing fields of each section. Worklists, cohorts, month close and data quality
 * join it instead of writing their own rules. When the rules change, a new migration recreates
 * the view from `caseCompletenessViewSql()`; tests/server/registry/views.test.ts fails until then.
 */
import {
  COMPLETENESS_SECTIONS,
  ELIGIBLE_CASE_RULES,
  EPISODE_REQUIRED_FIELDS,
  EVENT_REQUIRED_FIELDS,
  EXCLUDED_CASE_RULES,
  type CaseFieldRule,
  type CompletenessSection,
} from '../../shared/registry/completeness.js';
import { CASE_FIELDS } from '../../shared/registry/case.js';
import { fieldMeta } from '../../shared/registry/meta.js';
import { CASE_COLUMNS, THERAPY_COLUMNS } from './columns.js';

const lit = (s: string) => `'${s.replace(/'/g, "''")}'`;
const sectionOf = (f: CaseFieldRule['field']): CompletenessSection => {
  const s = fieldMeta(CASE_FIELDS[f])?.section;
  return s && s !== 'registry' ? s : 'patient';
};

function emptyTest(field: CaseFieldRule['field']): string {
  const { column, kind } = CASE_COLUMNS[field];
  return kind === 'text' ? `NULLIF(c.${column}, '') IS NULL` : `c.${column} IS NULL`;
}

function ruleSql(r: CaseFieldRule, population: 'eligible' | 'excluded'): string {
  const who = population === 'eligible' ? 'c.eligible IS DISTINCT FROM false' : 'c.eligible = false';
  const conds = [who];
  if (r.when) conds.push(`c.${CASE_COLUMNS[r.when.field].column} = ${typeof r.when.equals === 'string' ? lit(r.when.equals) : String(r.when.equals)}`);
  const missing = r.mustBe === true ? `c.${CASE_COLUMNS[r.field].column} IS DISTINCT FROM true` : emptyTest(r.field);
  return `CASE WHEN ${conds.join(' AND ')} AND ${missing} THEN ${lit(r.field)} END`;
}

const EPISODE_COLUMN: Record<(typeof EPISODE_REQUIRED_FIELDS)[number], string> = {
  modality: THERAPY_COLUMNS.modality.column,
  startPostoperativeDay: THERAPY_COLUMNS.startPostoperativeDay.column,
  sessionsPrescribed: THERAPY_COLUMNS.sessionsPrescribed.column,
  sessionsDelivered: THERAPY_COLUMNS.sessionsDelivered.column,
};
const EVENT_COLUMN: Record<(typeof EVENT_REQUIRED_FIELDS)[number], string> = {
  type: 'type',
  onsetPostoperativeDay: 'onset_postoperative_day',
  clavienDindo: 'clavien_dindo',
};

function sectionArray(section: CompletenessSection): string {
  const parts: string[] = [];
  for (const r of ELIGIBLE_CASE_RULES) if (sectionOf(r.field) === section) parts.push(ruleSql(r, 'eligible'));
  for (const r of EXCLUDED_CASE_RULES) if (sectionOf(r.field) === section) parts.push(ruleSql(r, 'excluded'));
  if (section === 'therapy') {
    parts.push(
      `CASE WHEN c.eligible IS DISTINCT FROM false AND c.therapy_given = true AND NOT COALESCE(te.any_episode, false) THEN 'therapy.episodes' END`,
      `CASE WHEN c.eligible IS DISTINCT FROM false AND c.therapy_given = false AND COALESCE(te.any_episode, false) THEN 'therapyGiven' END`,
    );
  }
  let sql = `array_remove(ARRAY[${parts.length ? parts.join(',\n      ') : 'NULL'}]::text[], NULL)`;
  if (section === 'therapy') sql += `\n      || CASE WHEN c.eligible IS DISTINCT FROM false THEN COALESCE(te.missing, '{}') ELSE '{}' END`;
  if (section === 'outcomes') sql += `\n      || CASE WHEN c.eligible IS DISTINCT FROM false THEN COALESCE(oe.missing, '{}') ELSE '{}' END`;
  return sql;
}

const col = (s: CompletenessSection) => `missing_${s.replace('-', '_')}`;

/**
 * The body of `CREATE VIEW case_completeness AS ...`. The case's current episodes and events
 * are read once each (one aggregate per table), and each section's array is computed once per
 * case in a LATERAL subquery (OFFSET 0 keeps the planner from inlining it into `missing`
 * and `complete`).
 */
export function caseCompletenessSelectSql(): string {
  const inner = COMPLETENESS_SECTIONS.map((s) => `    ${sectionArray(s)} AS ${col(s)}`).join(',\n');
  const all = COMPLETENESS_SECTIONS.map((s) => `m.${col(s)}`).join(' || ');
  const values = (fields: readonly string[], alias: string, columns: Record<string, string>) =>
    `VALUES ${fields.map((f, i) => `(${i}, ${lit(f)}, ${alias}.${columns[f]} IS NULL)`).join(', ')}`;
  return `SELECT c.id AS case_id, c.site_id, c.status, c.surgery_date, ${COMPLETENESS_SECTIONS.map((s) => `m.${col(s)}`).join(', ')}, a.missing, cardinality(a.missing) = 0 AS complete
FROM surgical_cases c
LEFT JOIN LATERAL (
  SELECT bool_or(true) AS any_episode,
         array_agg('therapy.' || e.id || '.' || f.name ORDER BY e.created_at, e.id, f.ord) FILTER (WHERE f.missing) AS missing
    FROM therapy_episodes e CROSS JOIN LATERAL (${values(EPISODE_REQUIRED_FIELDS, 'e', EPISODE_COLUMN)}) AS f(ord, name, missing)
   WHERE e.case_id = c.id AND e.removed_at IS NULL
) te ON true
LEFT JOIN LATERAL (
  SELECT array_agg('outcomes.' || o.id || '.' || f.name ORDER BY o.created_at, o.id, f.ord) FILTER (WHERE f.missing) AS missing
    FROM outcome_events o CROSS JOIN LATERAL (${values(EVENT_REQUIRED_FIELDS, 'o', EVENT_COLUMN)}) AS f(ord, name, missing)
   WHERE o.case_id = c.id AND o.removed_at IS NULL
) oe ON true
CROSS JOIN LATERAL (
  SELECT
${inner}
  OFFSET 0
) m
CROSS JOIN LATERAL (SELECT ${all} AS missing OFFSET 0) a`;
}

export function caseCompletenessViewSql(): string {
  return `CREATE VIEW case_completeness AS\n${caseCompletenessSelectSql()}`;
}
