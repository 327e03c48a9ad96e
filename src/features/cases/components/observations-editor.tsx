/**
 * The evidence of one outcome event as dated observations. Which fields each kind has, and
 * their code lists and units, are read from the shared ObservationSchema (one zod object per
 * kind), so a new kind or field in the contract shows up here without a second copy.
 */
import { useState } from 'react';
import { useFieldArray, useWatch, type Control, type Path } from 'react-hook-form';
import type { z } from 'zod';
import { OBSERVATION_KINDS, OBSERVATION_KIND_LABELS, PPC_EVENT_TYPE_LABELS, type ObservationKind } from '../../../../shared/clinical/codes.js';
import { IMAGING_COURSE_LABELS, IMAGING_FINDING_TYPE_LABELS, IMAGING_MODALITY_LABELS, ObservationSchema } from '../../../../shared/clinical/observations.js';
import { UNIT_LABELS } from '../../../../shared/clinical/units.js';
import { Button, inputClass } from '../../../components/ui.js';
import type { CaseFormValues } from '../form-model.js';
import { CheckboxField, DateField, NumberField, SelectField, TextField } from './fields.js';

type Shape = Record<string, z.ZodType>;
type Def = { type: string; innerType?: z.ZodType; element?: z.ZodType; values?: unknown[] };
const defOf = (s: z.ZodType) => (s as unknown as { def: Def }).def;
const unwrap = (s: z.ZodType): { schema: z.ZodType; optional: boolean } => {
  const d = defOf(s);
  return d.type === 'optional' ? { schema: d.innerType!, optional: true } : { schema: s, optional: false };
};

const KIND_SHAPES: Record<string, Shape> = Object.fromEntries(
  (ObservationSchema as unknown as { options: { shape: Shape }[] }).options.map((o) => [String(defOf(o.shape.kind).values?.[0]), o.shape]),
);
const BASE_KEYS = new Set(['id', 'kind', 'date', 'postoperativeDay']);

/** Words for observation field names (the contract names them in code). */
const FIELD_LABELS: Record<string, string> = {
  modality: 'Imaging', findings: 'Findings', definitive: 'Definitive report (not "possible")', value: 'Value', unit: 'Unit', which: 'Lowest or highest',
  breathing: 'Breathing', percent: 'SpO2 (%)', change: 'Change in support', newPurulent: 'New purulent sputum', changedCharacter: 'Change in character',
  increasedSecretionsOrSuctioning: 'More secretions or suctioning', colour: 'Colour', sign: 'Sign', onset: 'New or worse', finding: 'Finding',
  newSinceBaseline: 'New since the pre-operative assessment', altered: 'Altered mental status', otherRecognisedCause: 'Another recognised cause',
  organismsGrown: 'Organisms grown', organism: 'Organism (name only)', indication: 'Indication', evidence: 'How it is known', diagnosis: 'Diagnosis',
};
const VALUE_LABELS: Record<string, Readonly<Record<string, string>>> = {
  modality: IMAGING_MODALITY_LABELS, unit: UNIT_LABELS as Record<string, string>, diagnosis: PPC_EVENT_TYPE_LABELS,
};
const words = (v: string) => v.charAt(0).toUpperCase() + v.slice(1).replace(/-/g, ' ');
const labelsFor = (key: string, options: readonly string[]) => VALUE_LABELS[key] ?? Object.fromEntries(options.map((o) => [o, words(o)]));

let seq = 0;
const newId = () => `obs-${Date.now().toString(36)}-${(seq++).toString(36)}`;

/** A new observation of a kind: booleans start as no, units as the first the quantity accepts. */
export function newObservation(kind: ObservationKind, date?: string): Record<string, unknown> {
  const o: Record<string, unknown> = { id: newId(), kind };
  if (date) o.date = date;
  for (const [k, s] of Object.entries(KIND_SHAPES[kind])) {
    if (BASE_KEYS.has(k)) continue;
    const { schema, optional } = unwrap(s);
    const d = defOf(schema);
    if (d.type === 'boolean' && !optional) o[k] = false;
    if (k === 'unit' && d.type === 'enum') o[k] = (schema as unknown as { options: string[] }).options[0];
    if (k === 'findings') o[k] = [{ type: 'infiltrate', course: 'new' }];
  }
  return o;
}

function FindingsEditor({ control, name }: { control: Control<CaseFormValues>; name: string }) {
  const { fields, append, remove } = useFieldArray({ control, name: name as 'outcomes.0.observations' as never });
  const imaging = KIND_SHAPES['chest-imaging'].findings;
  const findingShape = (defOf(imaging).element as unknown as { shape: Shape }).shape;
  const types = (findingShape.type as unknown as { options: string[] }).options;
  const courses = (unwrap(findingShape.course).schema as unknown as { options: string[] }).options;
  return (
    <fieldset className="col-span-full rounded border border-line p-2">
      <legend className="px-1 text-sm font-semibold">Findings</legend>
      {fields.map((f, j) => (
        <div key={f.id} className="mb-2 grid gap-2 @md:grid-cols-[1fr_10rem_auto] @md:items-end">
          <SelectField control={control} name={`${name}.${j}.type` as Path<CaseFormValues>} label={`Finding ${j + 1}`} options={types} labels={IMAGING_FINDING_TYPE_LABELS} empty="Choose…" optional />
          <SelectField control={control} name={`${name}.${j}.course` as Path<CaseFormValues>} label="Course" options={courses} labels={IMAGING_COURSE_LABELS} empty="Not stated" optional />
          <Button type="button" variant="ghost" onClick={() => remove(j)} aria-label={`Remove finding ${j + 1}`}>Remove</Button>
        </div>
      ))}
      <Button type="button" variant="secondary" onClick={() => append({ type: 'infiltrate', course: 'new' } as never)}>Add a finding</Button>
    </fieldset>
  );
}

function ObservationFields({ control, base, kind }: { control: Control<CaseFormValues>; base: string; kind: ObservationKind }) {
  const shape = KIND_SHAPES[kind];
  return (
    <>
      {Object.entries(shape).filter(([k]) => !BASE_KEYS.has(k)).map(([k, s]) => {
        const name = `${base}.${k}` as Path<CaseFormValues>;
        const { schema, optional } = unwrap(s);
        const d = defOf(schema);
        const label = FIELD_LABELS[k] ?? words(k);
        if (k === 'findings') return <FindingsEditor key={k} control={control} name={`${base}.${k}`} />;
        if (d.type === 'enum') {
          const options = (schema as unknown as { options: string[] }).options;
          return <SelectField key={k} control={control} name={name} label={label} options={options} labels={labelsFor(k, options)} empty={optional ? 'Not stated' : 'Choose…'} optional />;
        }
        if (d.type === 'boolean') return <CheckboxField key={k} control={control} name={name} label={label} />;
        if (d.type === 'number') return <NumberField key={k} control={control} name={name} label={label} optional />;
        return <TextField key={k} control={control} name={name} label={label} optional maxLength={60} />;
      })}
    </>
  );
}

export function ObservationsEditor({ control, eventIndex, surgeryDate }: { control: Control<CaseFormValues>; eventIndex: number; surgeryDate?: string | null }) {
  const name = `outcomes.${eventIndex}.observations` as const;
  const { fields, append, remove } = useFieldArray({ control, name });
  const values = useWatch({ control, name }) as { kind: ObservationKind; date?: string; postoperativeDay?: number }[] | undefined;
  const [kind, setKind] = useState<ObservationKind>('chest-imaging');
  const podOf = (date?: string) => (date && surgeryDate ? Math.round((Date.parse(date) - Date.parse(surgeryDate)) / 86_400_000) : null);
  return (
    <div className="flex flex-col gap-2">
      <h4 className="text-sm font-semibold">Evidence: dated observations</h4>
      <p className="text-xs text-muted">Enter what was observed, with its value, unit and date; Alveolog works out which definition criteria are met. A post-operative day can be given instead of a date (day 0 is the day of surgery).</p>
      {fields.length === 0 && <p className="text-sm text-muted">No observations yet.</p>}
      <ol className="flex flex-col gap-2" aria-label={`Observations of event ${eventIndex + 1}`}>
        {fields.map((f, j) => {
          const v = values?.[j];
          const pod = podOf(v?.date);
          return (
            <li key={f.id} className="@container rounded border border-line bg-surface p-2">
              <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
                <p className="text-sm font-semibold">{j + 1}. {v ? OBSERVATION_KIND_LABELS[v.kind] : ''}{pod != null && <span className="ml-2 font-normal text-muted">post-operative day {pod}</span>}</p>
                <Button type="button" variant="ghost" onClick={() => remove(j)} aria-label={`Remove observation ${j + 1}`}>Remove</Button>
              </div>
              <div className="grid gap-2 @md:grid-cols-2 @xl:grid-cols-4">
                <DateField control={control} name={`${name}.${j}.date` as Path<CaseFormValues>} label="Date" optional />
                <NumberField control={control} name={`${name}.${j}.postoperativeDay` as Path<CaseFormValues>} label="or post-operative day" optional />
                {v && <ObservationFields control={control} base={`${name}.${j}`} kind={v.kind} />}
              </div>
            </li>
          );
        })}
      </ol>
      <div className="flex flex-wrap items-end gap-2">
        <label className="flex flex-col gap-1 text-sm font-semibold">Kind of observation
          <select className={inputClass} value={kind} onChange={(e) => setKind(e.target.value as ObservationKind)}>
            {OBSERVATION_KINDS.map((k) => <option key={k} value={k}>{OBSERVATION_KIND_LABELS[k]}</option>)}
          </select>
        </label>
        <Button type="button" variant="secondary" onClick={() => append(newObservation(kind) as never)}>Add observation</Button>
      </div>
    </div>
  );
}
