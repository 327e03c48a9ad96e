import { useState } from 'react';
import type { Mapping, SheetInfo } from '../../../../shared/imports/api.js';
import { IMPORT_COLUMNS } from '../../../../shared/imports/fields.js';
import { Button, Field, inputClass } from '../../../components/ui.js';
import { usePresets } from '../api/imports.js';

const DROP = '__drop__';

/** One select per header of the file: a registry field, or "leave out" (the column is dropped and never stored). */
export function MappingEditor({ sheets, siteId, initial, busy, onSubmit }: {
  sheets: readonly SheetInfo[]; siteId: string; initial: Mapping | null; busy: boolean;
  onSubmit: (mapping: Mapping, presetName?: string) => void;
}) {
  const [mapping, setMapping] = useState<Mapping>(() => initial ?? Object.fromEntries(sheets.map((s) => [s.kind, { ...s.proposed }])));
  const [presetName, setPresetName] = useState('');
  const presets = usePresets(siteId);
  const set = (kind: SheetInfo['kind'], header: string, field: string | null) => setMapping((m) => ({ ...m, [kind]: { ...(m[kind] ?? {}), [header]: field } }));
  const applyPreset = (id: string) => {
    const p = presets.data?.find((x) => x.id === id);
    if (!p) return;
    setMapping((m) => {
      const out: Mapping = { ...m };
      for (const s of sheets) {
        const from = p.mapping[s.kind] ?? {};
        out[s.kind] = { ...(m[s.kind] ?? {}), ...Object.fromEntries(Object.entries(from).filter(([h]) => s.headers.includes(h))) };
      }
      return out;
    });
  };
  return (
    <form className="flex flex-col gap-4" onSubmit={(e) => { e.preventDefault(); onSubmit(mapping, presetName.trim() || undefined); }} aria-label="Map the columns">
      {!!presets.data?.length && (
        <Field label="Use a saved mapping of this site" htmlFor="imp-preset">
          <select id="imp-preset" className={inputClass} defaultValue="" onChange={(e) => applyPreset(e.target.value)}>
            <option value="">Choose a preset…</option>
            {presets.data.map((p) => <option key={p.id} value={p.id}>{p.name}</option>)}
          </select>
        </Field>
      )}
      {sheets.map((s) => (
        <fieldset key={s.kind} className="rounded border border-line p-3">
          <legend className="px-1 text-sm font-semibold">Sheet “{s.sheet}” — {s.rows.toLocaleString()} rows</legend>
          <table className="w-full text-sm">
            <caption className="sr-only">Columns of sheet {s.sheet} and the registry field each holds</caption>
            <thead><tr className="border-b border-line text-left"><th scope="col" className="px-2 py-1">Column in the file</th><th scope="col" className="px-2 py-1">Registry field</th></tr></thead>
            <tbody>
              {s.headers.map((h, i) => {
                const v = mapping[s.kind]?.[h];
                const id = `map-${s.kind}-${i}`;
                return (
                  <tr key={h} className="border-b border-line">
                    <td className="px-2 py-1"><label htmlFor={id}>{h}</label>{s.proposed[h] && v === s.proposed[h] && <span className="ml-2 text-xs text-muted">(matched)</span>}</td>
                    <td className="px-2 py-1">
                      <select id={id} className={`${inputClass} w-full ${v === undefined ? 'border-danger' : ''}`} value={v === undefined ? '' : v === null ? DROP : v} onChange={(e) => set(s.kind, h, e.target.value === DROP ? null : e.target.value)}>
                        {v === undefined && <option value="">Choose…</option>}
                        <option value={DROP}>Leave out (not read, not stored)</option>
                        {IMPORT_COLUMNS[s.kind].map((c) => <option key={c.key} value={c.key}>{c.label}{c.unit ? ` (${c.unit})` : ''}</option>)}
                      </select>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </fieldset>
      ))}
      <Field label="Save this mapping for the site as (optional)" htmlFor="imp-save-preset" hint="The next export from the same system is mapped in one step.">
        <input id="imp-save-preset" className={inputClass} value={presetName} maxLength={60} onChange={(e) => setPresetName(e.target.value)} />
      </Field>
      <div><Button type="submit" disabled={busy}>{busy ? 'Starting…' : 'Run the dry run'}</Button></div>
    </form>
  );
}
