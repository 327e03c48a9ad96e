import { useEffect, useRef, useState } from 'react';
import { Button, Notice } from '../../../components/ui.js';
import { showValue, type FieldConflict } from '../form-model.js';

/**
 * After a 409: both versions side by side for every field both people changed; the user picks
 * per field. Nothing typed is lost: the choices are applied to the form, then saved again.
 */
export function ConflictPanel({ conflicts, theirsBy, onApply, onCancel }: { conflicts: FieldConflict[]; theirsBy: string; onApply: (takeTheirs: Set<string>) => void; onCancel: () => void }) {
  const [theirs, setTheirs] = useState<Set<string>>(new Set());
  const ref = useRef<HTMLElement>(null);
  // The save button may be far below: bring the choice into view and give it focus.
  useEffect(() => { ref.current?.scrollIntoView({ block: 'start' }); ref.current?.focus(); }, []);
  const pickTheirs = (path: string, yes: boolean) => setTheirs((s) => { const n = new Set(s); if (yes) n.add(path); else n.delete(path); return n; });
  return (
    <section ref={ref} tabIndex={-1} role="alertdialog" aria-labelledby="conflict-title" aria-describedby="conflict-text" className="rounded border-2 border-ochre bg-panel p-3">
      <h2 id="conflict-title" className="text-base font-semibold">Someone else saved this case while you were editing</h2>
      <p id="conflict-text" className="mt-1 text-sm">{theirsBy} Nothing of yours was saved or lost. Fields only they changed are taken from their version; fields only you changed keep your value.</p>
      {conflicts.length === 0 ? (
        <Notice tone="ok">None of the fields you changed were changed by them. Apply to bring in their version, then save again.</Notice>
      ) : (
        <div className="mt-2 overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Fields changed by both</caption>
            <thead className="border-b border-line text-muted"><tr><th scope="col" className="py-1 pr-2">Field</th><th scope="col" className="pr-2">Your version</th><th scope="col" className="pr-2">Saved version</th><th scope="col">Keep</th></tr></thead>
            <tbody>
              {conflicts.map((c) => (
                <tr key={c.path} className="border-b border-line/60 align-top">
                  <th scope="row" className="py-1 pr-2 font-semibold">{c.label}</th>
                  <td className="pr-2 break-all">{showValue(c.mine)}</td>
                  <td className="pr-2 break-all">{showValue(c.theirs)}</td>
                  <td>
                    <fieldset className="flex flex-col">
                      <legend className="sr-only">Keep which value of {c.label}</legend>
                      <label className="flex items-center gap-1"><input type="radio" name={`keep-${c.path}`} checked={!theirs.has(c.path)} onChange={() => pickTheirs(c.path, false)} /> Mine</label>
                      <label className="flex items-center gap-1"><input type="radio" name={`keep-${c.path}`} checked={theirs.has(c.path)} onChange={() => pickTheirs(c.path, true)} /> Saved</label>
                    </fieldset>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="mt-3 flex flex-wrap gap-2">
        <Button type="button" onClick={() => onApply(theirs)}>Apply my choices to the saved version</Button>
        <Button type="button" variant="secondary" onClick={onCancel}>Decide later (keep editing)</Button>
      </div>
    </section>
  );
}
