/**
 * Re-abstraction: admins and analysts draw a random sample of verified cases (sites, size,
 * fields, second abstractor; the seed is shown so the draw can be repeated); the second
 * abstractor opens the samples assigned to them; reports show agreement per field.
 */
import { useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import type { ColumnDef } from '@tanstack/react-table';
import { REABSTRACTION_FIELD_NAMES, REABSTRACTION_FIELDS, fieldLabel, type ReabstractionField, type SampleSummary } from '../../../shared/quality/reabstraction.js';
import { Button, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useAbstractors } from './api/get-abstractors.js';
import { useDrawSample } from './api/draw-sample.js';
import { useSamples } from './api/get-samples.js';
import { DataTable } from './components/data-table.js';
import { useMySites } from './components/site-select.js';

const DEFAULT_FIELDS: ReabstractionField[] = ['asaClass', 'smokingStatus', 'copd', 'urgency', 'age', 'heightCm', 'weightKg', 'durationMinutes'];
const KIND_WORD = { coded: 'coded (kappa)', number: 'number (limits of agreement)', date: 'date (limits of agreement, days)' } as const;

function DrawForm() {
  const sites = useMySites();
  const [siteIds, setSiteIds] = useState<string[]>([]);
  const [size, setSize] = useState('20');
  const [fields, setFields] = useState<ReabstractionField[]>(DEFAULT_FIELDS);
  const [reabstractorId, setReabstractor] = useState('');
  const [seed, setSeed] = useState('');
  const abstractors = useAbstractors(siteIds);
  const draw = useDrawSample();
  const toggle = <T,>(list: T[], x: T) => (list.includes(x) ? list.filter((y) => y !== x) : [...list, x]);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    draw.mutate({ siteIds, size: Number(size), fields, reabstractorId, ...(seed.trim() ? { seed: Number(seed) } : {}) });
  };
  return (
    <Panel title="Draw a sample">
      <form onSubmit={submit} className="grid gap-4">
        <fieldset className="flex flex-wrap gap-4">
          <legend className="mb-1 text-sm font-semibold">Sites</legend>
          {sites.map((s) => (
            <label key={s.id} className="flex items-center gap-1 text-sm"><input type="checkbox" checked={siteIds.includes(s.id)} onChange={() => { setSiteIds(toggle(siteIds, s.id)); setReabstractor(''); }} /> {s.code}</label>
          ))}
        </fieldset>
        <div className="flex flex-wrap items-end gap-4">
          <Field label="Number of cases" htmlFor="rs-size"><input id="rs-size" type="number" min={2} max={500} className={`${inputClass} w-28`} value={size} onChange={(e) => setSize(e.target.value)} /></Field>
          <Field label="Second abstractor" htmlFor="rs-who" hint="An abstractor of every chosen site; cases they entered or changed are left out.">
            <select id="rs-who" className={inputClass} value={reabstractorId} onChange={(e) => setReabstractor(e.target.value)} disabled={!siteIds.length}>
              <option value="">{siteIds.length ? 'Choose' : 'Choose the sites first'}</option>
              {(abstractors.data ?? []).map((a) => <option key={a.id} value={a.id}>{a.displayName} ({a.email})</option>)}
            </select>
          </Field>
          <Field label="Seed (optional)" htmlFor="rs-seed" hint="Leave empty for a fresh seed; enter one to repeat a draw.">
            <input id="rs-seed" inputMode="numeric" className={`${inputClass} w-36`} value={seed} onChange={(e) => setSeed(e.target.value.replace(/\D/g, ''))} />
          </Field>
        </div>
        <fieldset>
          <legend className="mb-1 text-sm font-semibold">Fields to re-abstract</legend>
          <div className="grid gap-1 sm:grid-cols-2 lg:grid-cols-3">
            {REABSTRACTION_FIELD_NAMES.map((f) => (
              <label key={f} className="flex items-center gap-1 text-sm"><input type="checkbox" checked={fields.includes(f)} onChange={() => setFields(toggle(fields, f))} /> {fieldLabel(f)} <span className="text-xs text-muted">· {KIND_WORD[REABSTRACTION_FIELDS[f]]}</span></label>
            ))}
          </div>
        </fieldset>
        <div><Button type="submit" disabled={draw.isPending || !siteIds.length || !reabstractorId || !fields.length}>{draw.isPending ? 'Drawing…' : 'Draw the sample'}</Button></div>
      </form>
      {draw.isSuccess && (
        <div className="mt-3"><Notice tone="ok">Drew <strong>{draw.data.size}</strong> of {draw.data.poolSize} eligible verified cases with seed <strong data-testid="drawn-seed" className="tabular">{draw.data.seed}</strong>. <Link className="text-accent underline" to={paths.quality.report(draw.data.id)}>Open its report</Link>.</Notice></div>
      )}
      {draw.error && <div className="mt-3"><Notice tone="danger">{getErrorMessage(draw.error)}{(draw.error as { fields?: { path: string; message: string }[] }).fields?.map((f) => ` ${f.path}: ${f.message}.`)}</Notice></div>}
    </Panel>
  );
}

export function ReabstractionPage() {
  const user = useSession().data?.user;
  const isSampler = !!user?.roles.some((r) => r === 'admin' || r === 'analyst');
  const samples = useSamples();
  const columns: ColumnDef<SampleSummary>[] = [
    { header: 'Drawn', cell: ({ row }) => row.original.createdAt.slice(0, 10) },
    { header: 'Seed', cell: ({ row }) => <span className="tabular">{row.original.seed}</span> },
    { header: 'Sites', cell: ({ row }) => row.original.siteCodes.join(', ') },
    { header: 'Cases', cell: ({ row }) => `${row.original.size} of ${row.original.poolSize}` },
    { header: 'Fields', cell: ({ row }) => row.original.fields.length },
    { header: 'Second abstractor', accessorKey: 'reabstractorEmail' },
    { header: 'Re-abstracted', cell: ({ row }) => `${row.original.entered} of ${row.original.size}` },
    {
      header: 'Open',
      cell: ({ row }) => (
        <span className="flex gap-3">
          {row.original.reabstractorId === user?.id && row.original.entered < row.original.size && <Link className="font-semibold text-accent hover:underline" to={paths.quality.entry(row.original.id)}>Re-abstract</Link>}
          {(isSampler || row.original.entered === row.original.size) && <Link className="text-accent underline" to={paths.quality.report(row.original.id)}>Report</Link>}
        </span>
      ),
    },
  ];
  return (
    <div>
      <PageHeader title="Re-abstraction" subtitle="Blind re-abstraction of a random sample of verified cases, and how well the two abstractions agree" />
      <div className="grid gap-4">
        {isSampler && <DrawForm />}
        <Panel title={isSampler ? 'Samples' : 'Samples assigned to you'}>
          {samples.isLoading && <Loading what="the samples" />}
          {samples.error && <ErrorState error={samples.error} />}
          {samples.data && (samples.data.length ? <DataTable caption="Re-abstraction samples" data={samples.data} columns={columns} getRowId={(s) => s.id} /> : <EmptyState title="No sample yet">{isSampler ? 'Draw one above.' : 'No sample is assigned to you.'}</EmptyState>)}
        </Panel>
      </div>
    </div>
  );
}
