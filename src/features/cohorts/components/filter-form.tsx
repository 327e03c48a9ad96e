import { useId, type ReactNode } from 'react';
import {
  ADHERENCE_BANDS,
  AGE_BANDS,
  ANALYSED_STATUSES,
  COHORT_URL_PARAMS,
  type CohortFilter,
} from '../../../../shared/analysis/cohort-filter.js';
import {
  APPROACH_LABELS,
  ASA_CLASS_LABELS,
  CASE_STATUS_LABELS,
  INCISION_SITE_LABELS,
  PPC_EVENT_TYPE_LABELS,
  PROCEDURE_CATEGORY_LABELS,
  SEX_LABELS,
  THERAPY_MODALITY_LABELS,
  URGENCY_LABELS,
} from '../../../../shared/clinical/codes.js';
import { ARISCAT_RISK_CLASS_LABELS } from '../../../../shared/clinical/scores.js';
import type { Site } from '../../../../shared/sites.js';
import { inputClass } from '../../../components/ui.js';

type ListField = { [K in keyof CohortFilter]-?: NonNullable<CohortFilter[K]> extends readonly string[] ? K : never }[keyof CohortFilter];

/**
 * The cohort builder's filters, read from and written to the page's URL parameters (with a
 * prefix for the second cohort of a comparison), so a link reproduces the view.
 */
export function CohortFilterForm({ params, onChange, prefix = '', sites, legend }: {
  params: URLSearchParams;
  onChange: (next: URLSearchParams) => void;
  prefix?: string;
  sites?: Site[];
  legend: string;
}) {
  const id = useId();
  const key = (field: keyof CohortFilter) => prefix + COHORT_URL_PARAMS[field];
  const getList = (field: ListField) => (params.get(key(field)) ?? '').split(',').filter(Boolean);
  const set = (field: keyof CohortFilter, value: string | null) => {
    const next = new URLSearchParams(params);
    if (value == null || value === '') next.delete(key(field));
    else next.set(key(field), value);
    onChange(next);
  };
  const toggle = (field: ListField, value: string, on: boolean) => {
    const cur = new Set(getList(field));
    if (on) cur.add(value); else cur.delete(value);
    set(field, [...cur].sort().join(','));
  };
  const checks = (field: ListField, label: string, options: Record<string, string>, open = false): ReactNode => {
    const chosen = getList(field);
    return (
      <details className="rounded border border-line bg-white px-2 py-1" open={open || chosen.length > 0}>
        <summary className="cursor-pointer text-sm font-semibold">{label}{chosen.length ? ` (${chosen.length})` : ''}</summary>
        <fieldset className="mt-1 grid grid-cols-1 gap-x-3 gap-y-0.5 sm:grid-cols-2">
          <legend className="sr-only">{label}</legend>
          {Object.entries(options).map(([value, text]) => (
            <label key={value} className="flex items-start gap-1.5 text-sm">
              <input type="checkbox" className="mt-1" checked={chosen.includes(value)} onChange={(e) => toggle(field, value, e.target.checked)} />
              <span>{text}</span>
            </label>
          ))}
        </fieldset>
      </details>
    );
  };
  const ageOptions = Object.fromEntries(Object.entries(AGE_BANDS).map(([k, v]) => [k, v.label]));
  const adherenceOptions = Object.fromEntries(Object.entries(ADHERENCE_BANDS).map(([k, v]) => [k, v.label]));
  const statusOptions = Object.fromEntries(ANALYSED_STATUSES.map((s) => [s, CASE_STATUS_LABELS[s]]));
  const siteOptions = sites ? Object.fromEntries(sites.map((s) => [s.id, `${s.code} — ${s.name}`])) : null;
  const unitOptions = sites
    ? Object.fromEntries(sites.filter((s) => !getList('sites').length || getList('sites').includes(s.id)).flatMap((s) => s.units.map((u) => [u.id, `${s.code} ${u.name}`])))
    : null;
  return (
    <fieldset className="flex flex-col gap-2" aria-label={legend}>
      <legend className="mb-1 text-base font-semibold">{legend}</legend>
      <div className="grid grid-cols-2 gap-2">
        <label className="flex flex-col text-sm font-semibold" htmlFor={`${id}-from`}>Surgery from
          <input id={`${id}-from`} type="date" className={inputClass} value={params.get(key('from')) ?? ''} onChange={(e) => set('from', e.target.value)} />
        </label>
        <label className="flex flex-col text-sm font-semibold" htmlFor={`${id}-to`}>Surgery to
          <input id={`${id}-to`} type="date" className={inputClass} value={params.get(key('to')) ?? ''} onChange={(e) => set('to', e.target.value)} />
        </label>
      </div>
      {siteOptions && checks('sites', 'Sites', siteOptions)}
      {unitOptions && Object.keys(unitOptions).length > 0 && checks('units', 'Units', unitOptions)}
      {checks('ariscatClasses', 'ARISCAT risk class', ARISCAT_RISK_CLASS_LABELS)}
      {checks('procedureCategories', 'Procedure category', PROCEDURE_CATEGORY_LABELS)}
      {checks('incisionSites', 'Incision site', INCISION_SITE_LABELS)}
      {checks('approaches', 'Approach', APPROACH_LABELS)}
      {checks('urgencies', 'Urgency', URGENCY_LABELS)}
      {checks('asaClasses', 'ASA class', ASA_CLASS_LABELS)}
      {checks('ageBands', 'Age band', ageOptions)}
      {checks('sexes', 'Sex', SEX_LABELS)}
      <label className="flex flex-col text-sm font-semibold" htmlFor={`${id}-therapy`}>Lung-expansion therapy received
        <select id={`${id}-therapy`} className={inputClass} value={params.get(key('therapy')) ?? ''} onChange={(e) => set('therapy', e.target.value)}>
          <option value="">Any</option>
          <option value="yes">Yes (at least one episode)</option>
          <option value="no">No</option>
        </select>
      </label>
      {checks('modalities', 'Therapy modality', THERAPY_MODALITY_LABELS)}
      <div className="grid grid-cols-2 gap-2">
        <label className="flex flex-col text-sm font-semibold" htmlFor={`${id}-ftmin`}>First therapy from day
          <input id={`${id}-ftmin`} type="number" min={0} max={365} className={inputClass} value={params.get(key('firstTherapyMin')) ?? ''} onChange={(e) => set('firstTherapyMin', e.target.value)} />
        </label>
        <label className="flex flex-col text-sm font-semibold" htmlFor={`${id}-ftmax`}>to day
          <input id={`${id}-ftmax`} type="number" min={0} max={365} className={inputClass} value={params.get(key('firstTherapyMax')) ?? ''} onChange={(e) => set('firstTherapyMax', e.target.value)} />
        </label>
      </div>
      {checks('adherenceBands', 'Therapy adherence', adherenceOptions)}
      {checks('statuses', 'Case status (only counted statuses)', statusOptions)}
      {checks('outcomeTypes', 'Cases with an outcome of type', PPC_EVENT_TYPE_LABELS)}
    </fieldset>
  );
}

/** The parameters of one cohort (with its prefix) out of a page's URL, as a query string without the prefix. */
export function cohortQuery(params: URLSearchParams, prefix = ''): URLSearchParams {
  const out = new URLSearchParams();
  for (const p of Object.values(COHORT_URL_PARAMS)) {
    const v = params.get(prefix + p);
    if (v) out.set(p, v);
  }
  return out;
}
