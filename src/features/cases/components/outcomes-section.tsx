/** Outcome events: one complication each, with its evidence and the definitions evaluated live. */
import { useState } from 'react';
import { useFieldArray, useWatch, type Control, type Path } from 'react-hook-form';
import { OUTCOME_FIELDS } from '../../../../shared/registry/outcome.js';
import { Button } from '../../../components/ui.js';
import type { CaseFormValues, EventForm } from '../form-model.js';
import { evaluateEvent, type EventContext } from '../outcome-evaluation.js';
import { DefinitionsView } from './definitions-view.js';
import { ObservationsEditor } from './observations-editor.js';
import { SchemaField } from './schema-field.js';
import { RemoveWithReason, type Removal } from './therapy-section.js';

function EventCard({ control, index, ctx, onRemove }: { control: Control<CaseFormValues>; index: number; ctx: EventContext; onRemove: (reason: string | null) => void }) {
  const e = useWatch({ control, name: `outcomes.${index}` }) as EventForm | undefined;
  const [confirming, setConfirming] = useState(false);
  if (!e) return null;
  const base = `outcomes.${index}` as const;
  const { views, invalid } = evaluateEvent(e.type, e.observations ?? [], ctx);
  const f = (k: keyof typeof OUTCOME_FIELDS, hint?: string) => <SchemaField key={k} control={control} name={`${base}.${k}` as Path<CaseFormValues>} schema={OUTCOME_FIELDS[k]} hint={hint} />;
  return (
    <li className="@container rounded border border-line bg-panel p-3">
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-base font-semibold">Event {index + 1}</h3>
        <Button type="button" variant="ghost" onClick={() => (e.recordId ? setConfirming(true) : onRemove(null))}>Remove event</Button>
      </div>
      {confirming && <RemoveWithReason what={`event ${index + 1}`} onConfirm={(r) => onRemove(r)} onCancel={() => setConfirming(false)} />}
      <div className="grid gap-3 @md:grid-cols-2 @2xl:grid-cols-4">
        {f('type')}
        {f('onsetPostoperativeDay', 'Day 0 is the day of surgery; up to day 30.')}
        {f('clavienDindo')}
        {f('clavienDindoDisability')}
        <div className="@md:col-span-2 @2xl:col-span-4">{f('notes')}</div>
      </div>
      <div className="mt-3 grid gap-3 @5xl:grid-cols-[3fr_2fr]">
        <ObservationsEditor control={control} eventIndex={index} surgeryDate={ctx.surgeryDate} />
        <div>
          {e.type ? <DefinitionsView views={views} invalid={invalid} /> : <p className="text-sm text-muted">Choose the complication to see the definitions evaluated.</p>}
        </div>
      </div>
    </li>
  );
}

export function OutcomesSection({ control, ctx, onRemoved }: { control: Control<CaseFormValues>; ctx: EventContext; onRemoved: (r: Removal) => void }) {
  const { fields, append, remove } = useFieldArray({ control, name: 'outcomes' });
  const list = useWatch({ control, name: 'outcomes' });
  return (
    <div className="flex flex-col gap-3">
      {fields.length === 0 && <p className="text-sm text-muted">No complications recorded. Add one event for each post-operative pulmonary complication.</p>}
      <ol className="flex flex-col gap-3">
        {fields.map((fl, i) => (
          <EventCard key={fl.id} control={control} index={i} ctx={ctx}
            onRemove={(reason) => { const id = list?.[i]?.recordId; if (id && reason) onRemoved({ list: 'outcomes', recordId: id, reason, label: `event ${i + 1}` }); remove(i); }} />
        ))}
      </ol>
      <div><Button type="button" variant="secondary" onClick={() => append({ type: null as never, onsetPostoperativeDay: null as never, clavienDindo: null, clavienDindoDisability: null, observations: [], notes: null })}>Add a complication</Button></div>
    </div>
  );
}
