import { useState, type FormEvent } from 'react';
import { Button, ErrorState, Field, inputClass, Loading, PageHeader, Panel } from '../../components/ui.js';
import { useCreateSite, useCreateUnit, useSites } from './api/admin.js';

function NewUnit({ siteId }: { siteId: string }) {
  const create = useCreateUnit();
  const [code, setCode] = useState('');
  const [name, setName] = useState('');
  const [kind, setKind] = useState<'ward' | 'icu' | 'theatre-recovery' | 'step-down'>('ward');
  const submit = (e: FormEvent) => { e.preventDefault(); create.mutate({ siteId, code, name, kind, active: true }, { onSuccess: () => { setCode(''); setName(''); } }); };
  return (
    <form onSubmit={submit} className="mt-2 flex flex-wrap items-end gap-2">
      <Field label="Unit code" htmlFor={`uc-${siteId}`}><input id={`uc-${siteId}`} className={inputClass} value={code} onChange={(e) => setCode(e.target.value.toUpperCase())} required /></Field>
      <Field label="Unit name" htmlFor={`un-${siteId}`}><input id={`un-${siteId}`} className={inputClass} value={name} onChange={(e) => setName(e.target.value)} required /></Field>
      <Field label="Kind" htmlFor={`uk-${siteId}`}>
        <select id={`uk-${siteId}`} className={inputClass} value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
          <option value="ward">Ward</option><option value="icu">Intensive care</option><option value="theatre-recovery">Theatre recovery</option><option value="step-down">Step-down</option>
        </select>
      </Field>
      <Button type="submit" variant="secondary">Add unit</Button>
      {create.error && <ErrorState error={create.error} />}
    </form>
  );
}

export function SitesPage() {
  const sites = useSites();
  const create = useCreateSite();
  const [code, setCode] = useState('');
  const [name, setName] = useState('');
  const [inclusion, setInclusion] = useState('');
  const [exclusion, setExclusion] = useState('');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    create.mutate({ code, name, inclusionCriteria: inclusion, exclusionCriteria: exclusion, active: true }, { onSuccess: () => { setCode(''); setName(''); setInclusion(''); setExclusion(''); } });
  };
  return (
    <div>
      <PageHeader title="Sites and units" subtitle="Each hospital states who is in its surveillance population." />
      <div className="flex flex-col gap-5">
        {sites.isPending && <Loading what="sites" />}
        {sites.error && <ErrorState error={sites.error} />}
        {sites.data?.items.map((s) => (
          <Panel key={s.id} title={`${s.name} (${s.code})`}>
            <dl className="grid gap-2 text-sm md:grid-cols-2">
              <div><dt className="font-semibold">Included</dt><dd className="text-muted">{s.inclusionCriteria || '—'}</dd></div>
              <div><dt className="font-semibold">Excluded</dt><dd className="text-muted">{s.exclusionCriteria || '—'}</dd></div>
            </dl>
            <p className="mt-3 text-sm"><span className="font-semibold">Units:</span> {s.units.map((u) => `${u.name} (${u.code})`).join(', ') || 'none yet'}</p>
            <NewUnit siteId={s.id} />
          </Panel>
        ))}
        <Panel title="Add a site">
          <form onSubmit={submit} className="grid gap-3 md:grid-cols-2">
            <Field label="Code" htmlFor="site-code" hint="2 to 8 capital letters or digits"><input id="site-code" className={inputClass} value={code} onChange={(e) => setCode(e.target.value.toUpperCase())} required /></Field>
            <Field label="Name" htmlFor="site-name"><input id="site-name" className={inputClass} value={name} onChange={(e) => setName(e.target.value)} required /></Field>
            <Field label="Inclusion criteria" htmlFor="site-inc"><textarea id="site-inc" className={inputClass} value={inclusion} onChange={(e) => setInclusion(e.target.value)} /></Field>
            <Field label="Exclusion criteria" htmlFor="site-exc"><textarea id="site-exc" className={inputClass} value={exclusion} onChange={(e) => setExclusion(e.target.value)} /></Field>
            <div className="md:col-span-2">{create.error && <ErrorState error={create.error} />}<Button type="submit" className="mt-2">Add site</Button></div>
          </form>
        </Panel>
      </div>
    </div>
  );
}
