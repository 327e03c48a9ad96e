/** The README and data-dictionary contents that travel with every export file. */
import { COHORT_URL_PARAMS, type CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { AGE_90_OR_OLDER } from '../../shared/exports/deid.js';
import { QUASI_IDENTIFIER_LABELS, type KAnonymitySummary, type QuasiIdentifier } from '../../shared/exports/k-anonymity.js';
import { EXPORT_LEVEL_LABELS, RISK_ACTION_LABELS, type RiskAction } from '../../shared/exports/schemas.js';
import { STUDY_ID_VARIABLE, type ExportVariable } from '../../shared/exports/variables.js';

export const DICTIONARY_HEADER = ['variable', 'label', 'type', 'unit', 'allowed values', 'definition', 'de-identification'] as const;

export function dictionaryRows(variables: readonly ExportVariable[], opts: { coarsen: boolean }): string[][] {
  const rows = [[STUDY_ID_VARIABLE.name, STUDY_ID_VARIABLE.label, STUDY_ID_VARIABLE.type, '', STUDY_ID_VARIABLE.allowedValues, STUDY_ID_VARIABLE.definition, STUDY_ID_VARIABLE.deidentification]];
  for (const v of variables) {
    let { type, allowedValues, deidentification } = v;
    if (opts.coarsen && v.name === 'age') {
      type = 'code';
      allowedValues = `0–19; 20–39; 40–59; 60–79; 80–89; ${AGE_90_OR_OLDER}`;
      deidentification = `${deidentification}; coarsened by the approver to 20-year bands`;
    }
    if (opts.coarsen && v.name === 'ageBand') deidentification = `${deidentification}; 20-year bands (coarsened by the approver)`;
    rows.push([v.name, v.label, type, v.unit, allowedValues, v.definition, deidentification]);
  }
  return rows;
}

function describeCohort(filter: CohortFilter, siteNames: Map<string, string> | null): string[] {
  const lines: string[] = [];
  for (const key of Object.keys(COHORT_URL_PARAMS) as (keyof CohortFilter)[]) {
    const v = filter[key];
    if (v == null || (Array.isArray(v) && v.length === 0)) continue;
    if (key === 'sites') lines.push(siteNames ? `sites: ${(v as string[]).map((id) => siteNames.get(id) ?? 'unknown').join(', ')}` : `sites: ${(v as string[]).length} chosen (names withheld: coded in the data)`);
    else if (key === 'units') lines.push(`units: ${(v as string[]).length} chosen (coded)`);
    else if (key === 'from' || key === 'to') lines.push(`surgery ${key}: ${String(v).slice(0, 4)} (the exact date is withheld)`);
    else lines.push(`${key}: ${Array.isArray(v) ? v.join(', ') : String(v)}`);
  }
  if (!lines.length) lines.push('every case that counts in analyses (complete, verified or locked) in the network');
  return lines;
}

export interface ReadmeInput {
  requestId: string;
  purpose: string;
  cohort: CohortFilter;
  kind: 'rows' | 'aggregate';
  level: 'deidentified' | 'limited';
  dua: { reference: string; expiresOn: string } | null;
  approver: string;
  approvedAt: Date;
  generatedAt: Date;
  expiresAt: Date;
  siteNamesApproved: boolean;
  siteNames: Map<string, string> | null;
  riskAction: RiskAction;
  risk: KAnonymitySummary | null;
  quasiIdentifiers: readonly QuasiIdentifier[];
  rows: number;
  sheets?: number;
}

/** README lines (a sheet in xlsx, README.txt in the zip). */
export function readmeLines(r: ReadmeInput): [string, string][] {
  const deid = [
    'HIPAA Safe Harbor, 45 CFR 164.514(b)(2): no names, record numbers, addresses or other direct identifiers; no registry case number and no keyed hash.',
    'Study ids are random and drawn for this export only (a case has another id in any other export).',
    r.level === 'limited'
      ? 'Limited data set under a data-use agreement (45 CFR 164.514(e)): surgery date as year and month.'
      : 'Fully de-identified: surgery date as the year only.',
    'Other dates as days relative to the surgery date (0 = surgery day; negative = before surgery).',
    `Ages over 89 as the single category "${AGE_90_OR_OLDER}".`,
    r.siteNamesApproved ? 'Site names shown: approved by the approver for this request.' : 'Sites and units as codes drawn for this export (Site A, Unit A, ...), in random order.',
    'Free-text fields are never exported; only fields the data dictionary marks exportable, and the derivations listed in the dictionary sheet.',
    'Rows are in random order.',
  ];
  if (r.kind === 'aggregate') deid.push('Aggregate table: counts from 1 to 10 suppressed, with complementary suppression so that no hidden count can be worked out from the totals (CMS cell-size suppression policy).');
  if (r.riskAction !== 'none') deid.push(`Re-identification risk (k-anonymity, Sweeney 2002): ${RISK_ACTION_LABELS[r.riskAction]}.`);
  const lines: [string, string][] = [
    ['Alveolog research export', ''],
    ['Request', r.requestId],
    ['Purpose', r.purpose],
    ['Level', EXPORT_LEVEL_LABELS[r.level]],
    ...(r.dua ? ([['Data-use agreement', `${r.dua.reference} (expires ${r.dua.expiresOn})`]] as [string, string][]) : []),
    ['Approved by', `${r.approver} on ${r.approvedAt.toISOString().slice(0, 10)}`],
    ['Generated', r.generatedAt.toISOString()],
    ['File deleted after', r.expiresAt.toISOString()],
    [r.kind === 'aggregate' ? 'Cases counted' : 'Rows', String(r.rows)],
    ...describeCohort(r.cohort, r.siteNamesApproved ? r.siteNames : null).map((l, i): [string, string] => [i === 0 ? 'Cohort definition' : '', l]),
    ...deid.map((l, i): [string, string] => [i === 0 ? 'De-identification applied' : '', l]),
  ];
  if (r.risk && r.kind === 'rows') {
    lines.push(['k-anonymity', `smallest class k = ${r.risk.k} over ${r.quasiIdentifiers.map((q) => QUASI_IDENTIFIER_LABELS[q]).join(', ') || 'no quasi-identifier'} (${r.risk.classes} classes, ${r.risk.classesBelow} under ${r.risk.threshold})`]);
  }
  if (r.sheets && r.sheets > 1) lines.push(['Sheets', `the data continue over ${r.sheets} sheets (Data, Data 2, ...): a sheet holds at most 1,048,576 rows including its header`]);
  lines.push(['Caution', 'For surveillance and quality-improvement research; not for bedside decisions. Do not try to re-identify anyone.']);
  return lines;
}
