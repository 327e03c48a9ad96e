/**
 * Blind re-abstraction by the second abstractor: one sampled case at a time, the chosen fields
 * entered from the source record. The first values are never sent to this page; "not
 * documented" is an answer of its own.
 */
import { useMemo, useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { BlindField } from '../../../shared/quality/reabstraction.js';
import { Button, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { ApiError, getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useBlindWork } from './api/get-blind-work.js';
import { useSubmitReabstraction } from './api/submit-reabstraction.js';

const ND = '__not_documented';
type Entry = Record<string, { value: string; unit?: string }>;

/** The form's text to the API's value (null = not documented; undefined = not answered). */
function toValue(f: BlindField, e: { value: string; unit?: string } | undefined): unknown {
  if (!e || e.value === '') return undefined;
  if (e.value === ND) return null;
  if (f.kind === 'coded') return f.options?.some((o) => o.value === 'true') ? e.value === 'true' : e.value;
  if (f.kind === 'date') return e.value;
  const n = Number(e.value);
  if (f.enteredUnits) return { value: n, unit: e.unit ?? f.enteredUnits[0] };
  return n;
}

function FieldInput({ f, entry, set, error }: { f: BlindField; entry: Entry; set: (k: string, v: { value: string; unit?: string }) => void; error?: string }) {
  const id = `rf-${f.field}`;
  const e = entry[f.field] ?? { value: '' };
  const nd = e.value === ND;
  const label = `${f.label}${f.unit && !f.enteredUnits ? ` (${f.unit})` : ''}`;
  if (f.kind === 'coded') {
    return (
      <Field label={label} htmlFor={id} error={error}>
        <select id={id} className={inputClass} value={e.value} onChange={(x) => set(f.field, { value: x.target.value })}>
          <option value="">Choose</option>
          {(f.options ?? []).map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
          <option value={ND}>Not documented in the source</option>
        </select>
      </Field>
    );
  }
  return (
    <Field label={label} htmlFor={id} error={error}>
      <div className="flex flex-wrap items-center gap-2">
        <input id={id} type={f.kind === 'date' ? 'date' : 'number'} step="any" disabled={nd} className={`${inputClass} w-40`} value={nd ? '' : e.value} onChange={(x) => set(f.field, { value: x.target.value, unit: e.unit })} />
        {f.enteredUnits && (
          <select aria-label={`${f.label} unit`} className={inputClass} value={e.unit ?? f.enteredUnits[0]} disabled={nd} onChange={(x) => set(f.field, { value: e.value, unit: x.target.value })}>
            {f.enteredUnits.map((u) => <option key={u} value={u}>{u}</option>)}
          </select>
        )}
        <label className="flex items-center gap-1 text-xs"><input type="checkbox" checked={nd} onChange={(x) => set(f.field, { value: x.target.checked ? ND : '', unit: e.unit })} /> not documented</label>
      </div>
    </Field>
  );
}

export function BlindEntryPage() {
  const { id = '' } = useParams();
  const work = useBlindWork(id);
  const submit = useSubmitReabstraction(id);
  const [entry, setEntry] = useState<Entry>({});
  const [missing, setMissing] = useState<string[]>([]);
  const pending = useMemo(() => (work.data?.items ?? []).filter((i) => !i.enteredAt), [work.data]);
  const current = pending[0];
  if (work.isLoading) return <Loading what="the cases to re-abstract" />;
  if (work.error) return <ErrorState error={work.error} retry={() => work.refetch()} />;
  const w = work.data!;
  const done = w.items.length - pending.length;
  const set = (k: string, v: { value: string; unit?: string }) => setEntry((e) => ({ ...e, [k]: v }));
  const onSubmit = (ev: FormEvent) => {
    ev.preventDefault();
    if (!current) return;
    const values: Record<string, unknown> = {};
    const unanswered: string[] = [];
    for (const f of w.fields) {
      const v = toValue(f, entry[f.field]);
      if (v === undefined) unanswered.push(f.field);
      else values[f.field] = v;
    }
    setMissing(unanswered);
    if (unanswered.length) return;
    submit.mutate({ itemId: current.id, values }, { onSuccess: () => { setEntry({}); window.scrollTo(0, 0); } });
  };
  const serverFields = submit.error instanceof ApiError ? Object.fromEntries((submit.error.fields ?? []).map((f) => [f.path.replace(/^values\./, ''), f.message])) : {};
  return (
    <div>
      <PageHeader title="Blind re-abstraction" subtitle={`Sample drawn ${w.sample.createdAt.slice(0, 10)} (seed ${w.sample.seed}) · ${done} of ${w.items.length} cases done`} actions={<Link className="text-sm text-accent underline" to={paths.quality.reabstraction}>All samples</Link>} />
      <div className="grid gap-4">
        <Notice>Enter each value from the source record (the hospital chart), not from the registry: the first abstraction is not shown and opening the case in the registry during re-abstraction is recorded. When the source does not document a value, say so.</Notice>
        {!current ? (
          <EmptyState title="All cases are re-abstracted">Thank you. The agreement report is with the analysts.</EmptyState>
        ) : (
          <Panel title={<span>Case <span data-testid="blind-case">{current.registryNumber}</span> ({current.siteCode}) · {current.ordinal} of {w.items.length}</span>}>
            <form onSubmit={onSubmit} className="grid gap-4" aria-label={`Re-abstraction of case ${current.registryNumber}`}>
              <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
                {w.fields.map((f) => <FieldInput key={f.field} f={f} entry={entry} set={set} error={missing.includes(f.field) ? 'answer this, or choose "not documented"' : serverFields[f.field]} />)}
              </div>
              <div className="flex items-center gap-3">
                <Button type="submit" disabled={submit.isPending}>{submit.isPending ? 'Saving…' : 'Save and go to the next case'}</Button>
                {missing.length > 0 && <span role="alert" className="text-sm text-danger">{missing.length} field{missing.length === 1 ? '' : 's'} still to answer.</span>}
              </div>
              {submit.error && !Object.keys(serverFields).length && <Notice tone="danger">{getErrorMessage(submit.error)}</Notice>}
            </form>
          </Panel>
        )}
        <Panel title="Cases of this sample">
          <ul className="grid gap-1 text-sm sm:grid-cols-3 lg:grid-cols-5">
            {w.items.map((i) => <li key={i.id} className="tabular">{i.ordinal}. {i.registryNumber} {i.enteredAt ? <span className="text-ok">· done</span> : <span className="text-muted">· to do</span>}</li>)}
          </ul>
        </Panel>
      </div>
    </div>
  );
}
