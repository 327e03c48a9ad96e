import { COHORT_URL_PARAMS, type CohortFilter } from '../../../../shared/analysis/cohort-filter.js';

const LABELS: Partial<Record<keyof CohortFilter, string>> = {
  from: 'Surgery from', to: 'Surgery to', sites: 'Sites', units: 'Units', procedureCategories: 'Procedure categories', incisionSites: 'Incision sites',
  approaches: 'Approaches', urgencies: 'Urgency', asaClasses: 'ASA classes', ariscatClasses: 'ARISCAT classes', ageBands: 'Age bands', sexes: 'Sex',
  therapy: 'Therapy received', modalities: 'Therapy modalities', firstTherapyMin: 'First therapy from day', firstTherapyMax: 'First therapy up to day',
  adherenceBands: 'Adherence', statuses: 'Statuses', outcomeTypes: 'Outcome types',
};

/** The cohort in words (site and unit ids are counted, not listed: their names are not the researcher's to see). */
export function CohortSummary({ cohort }: { cohort: CohortFilter }) {
  const items = (Object.keys(COHORT_URL_PARAMS) as (keyof CohortFilter)[]).flatMap((k) => {
    const v = cohort[k];
    if (v == null || (Array.isArray(v) && v.length === 0)) return [];
    const text = k === 'sites' || k === 'units' ? `${(v as string[]).length} chosen` : Array.isArray(v) ? v.join(', ') : String(v);
    return [[LABELS[k] ?? k, text] as const];
  });
  if (!items.length) return <p className="text-sm">Every case that counts in analyses (complete, verified or locked) in the network.</p>;
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 text-sm">
      {items.map(([k, v]) => (
        <div key={k} className="contents"><dt className="text-muted">{k}</dt><dd>{v}</dd></div>
      ))}
    </dl>
  );
}
