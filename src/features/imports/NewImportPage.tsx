import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button, ErrorState, Field, Notice, PageHeader, Panel, inputClass } from '../../components/ui.js';
import { useSession } from '../../lib/session.js';
import { TEMPLATE_URL, useSites, useUpload } from './api/imports.js';
import { importPaths } from './paths.js';

/** Step 1 and 2 of an import: the template, then the upload with its decimal separator. */
export function NewImportPage() {
  const user = useSession().data?.user;
  const sites = useSites();
  const upload = useUpload();
  const navigate = useNavigate();
  const mine = (sites.data?.items ?? []).filter((s) => s.active !== false && (user?.roles.includes('admin') || user?.siteIds.includes(s.id)));
  const [siteId, setSiteId] = useState('');
  const [decimal, setDecimal] = useState<'point' | 'comma'>('point');
  const [kind, setKind] = useState<'cases' | 'therapy' | 'outcomes'>('cases');
  const [file, setFile] = useState<File | null>(null);
  const site = siteId || mine[0]?.id || '';

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!file || !site) return;
    upload.mutate({ file, siteId: site, decimal, kind }, { onSuccess: (v) => navigate(importPaths.detail(v.id)) });
  };

  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <PageHeader title="Import from a spreadsheet" subtitle="Cases, therapy episodes and outcomes from a CSV or XLSX file: checked in a dry run, then written all at once or not at all." />
      <Panel title="1. Start from the template">
        <p className="mb-3 text-sm">The template has a sheet per record kind, the units and definitions in each header&rsquo;s note, drop-down lists for coded values, example rows and the data dictionary.</p>
        <a className="inline-flex rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold text-ink hover:border-accent" href={TEMPLATE_URL} download>Download the import template (.xlsx)</a>
      </Panel>
      <Panel title="2. Upload the file">
        <form className="flex flex-col gap-3" onSubmit={submit} aria-label="Upload a file to import">
          <Field label="Site the rows belong to" htmlFor="imp-site" hint="Rows with their own site code may name any of your sites.">
            <select id="imp-site" className={inputClass} value={site} onChange={(e) => setSiteId(e.target.value)}>
              {mine.map((s) => <option key={s.id} value={s.id}>{s.code} — {s.name}</option>)}
            </select>
          </Field>
          <fieldset className="flex flex-col gap-1">
            <legend className="text-sm font-semibold">Decimal separator in the file</legend>
            <label className="text-sm"><input type="radio" name="decimal" value="point" checked={decimal === 'point'} onChange={() => setDecimal('point')} /> Point (71.5)</label>
            <label className="text-sm"><input type="radio" name="decimal" value="comma" checked={decimal === 'comma'} onChange={() => setDecimal('comma')} /> Comma (71,5)</label>
          </fieldset>
          <Field label="A CSV file holds" htmlFor="imp-kind" hint="A workbook's sheets are recognised by their names (Cases, Therapy episodes, Outcomes).">
            <select id="imp-kind" className={inputClass} value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>
              <option value="cases">Cases</option>
              <option value="therapy">Therapy episodes</option>
              <option value="outcomes">Outcomes</option>
            </select>
          </Field>
          <Field label="File (.csv in UTF-8, or .xlsx)" htmlFor="imp-file">
            <input id="imp-file" type="file" accept=".csv,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
          </Field>
          <Notice tone="info">Columns you do not map (names, record numbers, addresses) are dropped while the file is read and never stored. The hospital identifier is kept only as a keyed hash. The file itself is deleted once the import is committed or abandoned.</Notice>
          {upload.error && <ErrorState error={upload.error} />}
          <div><Button type="submit" disabled={!file || !site || upload.isPending}>{upload.isPending ? 'Uploading…' : 'Upload and map columns'}</Button></div>
        </form>
      </Panel>
    </div>
  );
}
