import { useMemo, useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { CohortFilterSchema, cohortFilterFromParams, encodeCohortFilter, type CohortFilter } from '../../../shared/analysis/cohort-filter.js';
import { PROCEDURE_CATEGORIES, PROCEDURE_CATEGORY_LABELS, SEXES, SEX_LABELS, URGENCIES, URGENCY_LABELS } from '../../../shared/clinical/codes.js';
import { DICTIONARY_SECTION_LABELS, type DictionarySection } from '../../../shared/registry/meta.js';
import { EXPORT_LEVEL_LABELS } from '../../../shared/exports/schemas.js';
import type { ExportVariable } from '../../../shared/exports/variables.js';
import { Button, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { ApiError } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useCreateExport } from './api/create-export.js';
import { useExportVariables } from './api/get-export-variables.js';
import { CohortSummary } from './components/cohort-summary.js';

type Kind = 'rows' | 'aggregate';
type Level = 'deidentified' | 'limited';

/** The cohort lives in the URL (the analysis service's encoding), so a link from the cohort builder opens this form with it. */
function useCohortFromUrl(): { cohort: CohortFilter; error: string | null; set: (next: CohortFilter) => void } {
  const [params, setParams] = useSearchParams();
  const parsed = CohortFilterSchema.safeParse(cohortFilterFromParams(params));
  return {
    cohort: parsed.success ? parsed.data : {},
    error: parsed.success ? null : parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '),
    set: (next) => setParams(encodeCohortFilter(next), { replace: true }),
  };
}

function toggle<T>(list: readonly T[] | undefined, v: T): T[] {
  const l = list ?? [];
  return l.includes(v) ? l.filter((x) => x !== v) : [...l, v];
}

function CohortEditor({ cohort, set }: { cohort: CohortFilter; set: (c: CohortFilter) => void }) {
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <Field label="Surgery from" htmlFor="cohort-from"><input id="cohort-from" type="date" className={inputClass} value={cohort.from ?? ''} onChange={(e) => set({ ...cohort, from: e.target.value || undefined })} /></Field>
      <Field label="Surgery to" htmlFor="cohort-to"><input id="cohort-to" type="date" className={inputClass} value={cohort.to ?? ''} onChange={(e) => set({ ...cohort, to: e.target.value || undefined })} /></Field>
      <fieldset className="md:col-span-2">
        <legend className="text-sm font-semibold">Procedure categories <span className="font-normal text-muted">(none ticked = all)</span></legend>
        <div className="mt-1 grid gap-1 sm:grid-cols-2 lg:grid-cols-3">
          {PROCEDURE_CATEGORIES.map((c) => (
            <label key={c} className="flex items-center gap-2 text-sm"><input type="checkbox" checked={cohort.procedureCategories?.includes(c) ?? false} onChange={() => set({ ...cohort, procedureCategories: toggle(cohort.procedureCategories, c) })} />{PROCEDURE_CATEGORY_LABELS[c]}</label>
          ))}
        </div>
      </fieldset>
      <fieldset>
        <legend className="text-sm font-semibold">Sex</legend>
        {SEXES.map((s) => <label key={s} className="mr-4 inline-flex items-center gap-2 text-sm"><input type="checkbox" checked={cohort.sexes?.includes(s) ?? false} onChange={() => set({ ...cohort, sexes: toggle(cohort.sexes, s) })} />{SEX_LABELS[s]}</label>)}
      </fieldset>
      <fieldset>
        <legend className="text-sm font-semibold">Urgency</legend>
        {URGENCIES.map((u) => <label key={u} className="mr-4 inline-flex items-center gap-2 text-sm"><input type="checkbox" checked={cohort.urgencies?.includes(u) ?? false} onChange={() => set({ ...cohort, urgencies: toggle(cohort.urgencies, u) })} />{URGENCY_LABELS[u]}</label>)}
      </fieldset>
    </div>
  );
}

function FieldPicker({ variables, chosen, setChosen }: { variables: ExportVariable[]; chosen: string[]; setChosen: (c: string[]) => void }) {
  const sections = useMemo(() => {
    const m = new Map<string, ExportVariable[]>();
    for (const v of variables) m.set(v.section, [...(m.get(v.section) ?? []), v]);
    return [...m.entries()];
  }, [variables]);
  return (
    <div className="flex flex-col gap-4">
      {sections.map(([section, list]) => {
        const all = list.every((v) => chosen.includes(v.name));
        return (
          <fieldset key={section}>
            <legend className="flex items-center gap-3 text-sm font-semibold">
              {DICTIONARY_SECTION_LABELS[section as DictionarySection] ?? section}
              <button type="button" className="text-xs font-normal text-accent underline" onClick={() => setChosen(all ? chosen.filter((c) => !list.some((v) => v.name === c)) : [...new Set([...chosen, ...list.map((v) => v.name)])])}>
                {all ? 'clear section' : 'choose all'}
              </button>
            </legend>
            <div className="mt-1 grid gap-x-4 gap-y-1 sm:grid-cols-2 xl:grid-cols-3">
              {list.map((v) => (
                <div key={v.name} className="flex items-start gap-2 text-sm" title={v.definition}>
                  <input id={`var-${v.name}`} type="checkbox" className="mt-1" checked={chosen.includes(v.name)} onChange={() => setChosen(toggle(chosen, v.name))} aria-describedby={v.deidentification ? `var-${v.name}-deid` : undefined} />
                  <span>
                    <label htmlFor={`var-${v.name}`}>{v.label}{v.unit ? <span className="text-muted"> ({v.unit})</span> : null}</label>
                    {v.deidentification && <span id={`var-${v.name}-deid`} className="block text-xs text-muted">De-identified: {v.deidentification.replace(/ \(HIPAA.*$/, '')}</span>}
                  </span>
                </div>
              ))}
            </div>
          </fieldset>
        );
      })}
    </div>
  );
}

export function RequestExportPage() {
  const { cohort, error: cohortError, set: setCohort } = useCohortFromUrl();
  const vars = useExportVariables();
  const create = useCreateExport();
  const navigate = useNavigate();
  const [purpose, setPurpose] = useState('');
  const [kind, setKind] = useState<Kind>('rows');
  const [chosen, setChosen] = useState<string[]>([]);
  const [rowsBy, setRowsBy] = useState('');
  const [colsBy, setColsBy] = useState('');
  const [format, setFormat] = useState<'xlsx' | 'csv'>('xlsx');
  const [level, setLevel] = useState<Level>('deidentified');
  const [duaRef, setDuaRef] = useState('');
  const [duaExpires, setDuaExpires] = useState('');
  const [siteNames, setSiteNames] = useState(false);

  const fieldError = (path: string) => (create.error instanceof ApiError ? create.error.fields.find((f) => f.path === path || f.path.startsWith(`${path}.`))?.message : undefined);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate(
      {
        purpose, cohort, kind, format, level, siteNamesRequested: siteNames,
        ...(kind === 'rows' ? { fields: chosen } : { rowsBy, colsBy: colsBy || undefined }),
        ...(level === 'limited' ? { dua: { reference: duaRef, expiresOn: duaExpires } } : {}),
      },
      { onSuccess: () => navigate(paths.research.exports) },
    );
  };
  const dims = vars.data ? vars.data.items.filter((v) => vars.data.aggregateDimensions.includes(v.name)) : [];

  return (
    <div>
      <PageHeader title="Request a research dataset" subtitle="Every request is reviewed by an administrator; the file is de-identified by HIPAA Safe Harbor (45 CFR 164.514(b)(2)) and kept for a limited time." actions={<Link className="text-sm text-accent underline" to={paths.research.exports}>My exports</Link>} />
      <form onSubmit={submit} className="flex flex-col gap-5" noValidate>
        <Panel title="1. Purpose">
          <Field label="What the data are for" htmlFor="purpose" error={fieldError('purpose')} hint="At least 20 characters: the study question, the ethics or governance approval.">
            <textarea id="purpose" rows={3} className={inputClass} value={purpose} onChange={(e) => setPurpose(e.target.value)} aria-invalid={!!fieldError('purpose')} />
          </Field>
        </Panel>
        <Panel title="2. Cohort">
          {cohortError && <Notice tone="danger">The cohort in the address could not be read ({cohortError}); it was left empty.</Notice>}
          <div className="mb-3"><CohortSummary cohort={cohort} /></div>
          <CohortEditor cohort={cohort} set={setCohort} />
          <p className="mt-2 text-xs text-muted">Only cases that count in analyses (complete, verified or locked) are exported. The address of this page carries the cohort, so a link from the cohort builder opens it here.</p>
          {fieldError('cohort') && <p role="alert" className="text-xs text-danger">{fieldError('cohort')}</p>}
        </Panel>
        <Panel title="3. What to export">
          <fieldset className="mb-4 flex flex-wrap gap-4">
            <legend className="sr-only">Kind</legend>
            <label className="flex items-center gap-2 text-sm"><input type="radio" name="kind" checked={kind === 'rows'} onChange={() => setKind('rows')} />Row-level data (one row per case)</label>
            <label className="flex items-center gap-2 text-sm"><input type="radio" name="kind" checked={kind === 'aggregate'} onChange={() => setKind('aggregate')} />Aggregate table (counts; 1–10 suppressed)</label>
          </fieldset>
          {vars.isPending && <Loading what="the exportable variables" />}
          {vars.error && <ErrorState error={vars.error} retry={() => vars.refetch()} />}
          {vars.data && kind === 'rows' && (
            <>
              <p className="mb-2 text-sm text-muted">Only variables the data dictionary marks exportable are listed; free text is never exported. Each row gets a random study id drawn for this export.</p>
              {fieldError('fields') && <p role="alert" className="mb-2 text-xs text-danger">{fieldError('fields')}</p>}
              <FieldPicker variables={vars.data.items} chosen={chosen} setChosen={setChosen} />
              <p className="mt-2 text-sm tabular-nums">{chosen.length} variable{chosen.length === 1 ? '' : 's'} chosen (+ study id)</p>
            </>
          )}
          {vars.data && kind === 'aggregate' && (
            <div className="grid gap-3 md:grid-cols-2">
              <Field label="Count cases by (rows)" htmlFor="rows-by" error={fieldError('rowsBy')}>
                <select id="rows-by" className={inputClass} value={rowsBy} onChange={(e) => setRowsBy(e.target.value)}><option value="">Choose…</option>{dims.map((d) => <option key={d.name} value={d.name}>{d.label}</option>)}</select>
              </Field>
              <Field label="and by (columns, optional)" htmlFor="cols-by" error={fieldError('colsBy')}>
                <select id="cols-by" className={inputClass} value={colsBy} onChange={(e) => setColsBy(e.target.value)}><option value="">None (one-way table)</option>{dims.filter((d) => d.name !== rowsBy).map((d) => <option key={d.name} value={d.name}>{d.label}</option>)}</select>
              </Field>
            </div>
          )}
        </Panel>
        <Panel title="4. Format and level">
          <div className="grid gap-4 md:grid-cols-2">
            <fieldset>
              <legend className="text-sm font-semibold">Format</legend>
              <label className="flex items-center gap-2 text-sm"><input type="radio" name="format" checked={format === 'xlsx'} onChange={() => setFormat('xlsx')} />xlsx (data, dictionary and README sheets)</label>
              <label className="flex items-center gap-2 text-sm"><input type="radio" name="format" checked={format === 'csv'} onChange={() => setFormat('csv')} />CSV, UTF-8, zipped with its dictionary (any size)</label>
              {fieldError('format') && <p role="alert" className="text-xs text-danger">{fieldError('format')}</p>}
            </fieldset>
            <fieldset>
              <legend className="text-sm font-semibold">Level</legend>
              {(['deidentified', 'limited'] as const).map((l) => <label key={l} className="flex items-center gap-2 text-sm"><input type="radio" name="level" checked={level === l} onChange={() => setLevel(l)} />{EXPORT_LEVEL_LABELS[l]}</label>)}
            </fieldset>
            {level === 'limited' && (
              <>
                <Field label="Data-use agreement reference" htmlFor="dua-ref" error={fieldError('dua.reference') ?? fieldError('dua')}><input id="dua-ref" className={inputClass} value={duaRef} onChange={(e) => setDuaRef(e.target.value)} /></Field>
                <Field label="Agreement expires on" htmlFor="dua-exp" error={fieldError('dua.expiresOn')} hint="No limited data set is released or downloadable after this day."><input id="dua-exp" type="date" className={inputClass} value={duaExpires} onChange={(e) => setDuaExpires(e.target.value)} /></Field>
              </>
            )}
            <label className="flex items-start gap-2 text-sm md:col-span-2"><input type="checkbox" className="mt-1" checked={siteNames} onChange={() => setSiteNames(!siteNames)} /><span>Ask for site names instead of codes <span className="block text-xs text-muted">Say why in the purpose; the approver decides. Without approval, sites and units are codes drawn for this export.</span></span></label>
          </div>
        </Panel>
        {create.error && <ErrorState error={create.error} />}
        <div><Button type="submit" disabled={create.isPending}>{create.isPending ? 'Sending…' : 'Send the request for approval'}</Button></div>
      </form>
    </div>
  );
}
