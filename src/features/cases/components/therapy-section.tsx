/**
 * Lung-expansion therapy episodes. Which settings an episode shows, their units, usual and
 * possible ranges and defaults come from the shared per-modality tables; warnings come from
 * the same `checkTherapyEpisode` the server stores them with, and each carries the caution.
 */
import { useState } from 'react';
import { useFieldArray, useWatch, type Control, type Path, type UseFormSetValue } from 'react-hook-form';
import { checkTherapyEpisode } from '../../../../analysis/clinical/therapy-checks.js';
import { lungExpansionIndication, predictedBodyWeight } from '../../../../analysis/clinical/body.js';
import { CLINICAL_CAUTION } from '../../../../shared/clinical/checks.js';
import { MODALITY_TABLES, TherapyEpisodeFieldSchema, modalityDefaults, type NumericEpisodeField, type TherapyEpisodeField } from '../../../../shared/clinical/modalities.js';
import type { Sex, TherapyModality } from '../../../../shared/clinical/codes.js';
import { THERAPY_FIELDS, type TherapyFieldName } from '../../../../shared/registry/therapy.js';
import { ReasonSchema } from '../../../../shared/registry/text.js';
import { Button, ClinicalCaution, inputClass } from '../../../components/ui.js';
import type { CaseFormValues, EpisodeForm } from '../form-model.js';
import { SchemaField } from './schema-field.js';

export interface Removal { list: 'therapy' | 'outcomes'; recordId: string; reason: string; label: string }

const TABLE_FIELDS = new Set<string>(TherapyEpisodeFieldSchema.options);
/** Episode fields outside the per-modality tables: they apply to every modality. */
const GENERAL_AFTER: TherapyFieldName[] = ['endPostoperativeDay', 'prescribedSessionsPerDay'];
const pct = (x: number | null) => (x == null ? '—' : `${Math.round(x * 100)}%`);

function rangeHint(modality: TherapyModality, field: NumericEpisodeField): string | undefined {
  const spec = MODALITY_TABLES[modality].numeric[field];
  if (!spec) return undefined;
  const parts = [];
  if (spec.usual) parts.push(`usually ${spec.usual.min}–${spec.usual.max} ${spec.unit}`);
  if (field === 'flowLpm' || field === 'expiratoryPressureCmH2O') parts.push(`possible ${spec.possible.min}–${spec.possible.max} ${spec.unit}`);
  if (spec.default) parts.push(`pre-filled with ${spec.default.value} ${spec.unit}, a usual starting value: a default, not a rule`);
  return parts.length ? `${parts.join('; ')}.` : undefined;
}

/** A removal of a stored record needs a reason (nothing is hard-deleted). */
export function RemoveWithReason({ what, onConfirm, onCancel }: { what: string; onConfirm: (reason: string) => void; onCancel: () => void }) {
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const id = `remove-${what.replace(/\W+/g, '-')}`;
  return (
    <div className="mt-2 rounded border border-danger bg-danger-soft p-2 text-sm">
      <label htmlFor={id} className="font-semibold">Why is {what} removed? (kept in the audit trail)</label>
      <div className="mt-1 flex flex-wrap gap-2">
        <input id={id} className={`${inputClass} min-w-0 flex-1`} value={reason} onChange={(e) => setReason(e.target.value)} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-err` : undefined} />
        <Button type="button" variant="danger" onClick={() => { const r = ReasonSchema.safeParse(reason); if (!r.success) setError(r.error.issues[0].message); else onConfirm(r.data); }}>Remove</Button>
        <Button type="button" variant="secondary" onClick={onCancel}>Keep it</Button>
      </div>
      {error && <p id={`${id}-err`} role="alert" className="mt-1 text-xs text-danger">{error}</p>}
    </div>
  );
}

function EpisodeCard({ control, index, setValue, onRemove, adherence, heightCm, sex }: {
  control: Control<CaseFormValues>; index: number; setValue: UseFormSetValue<CaseFormValues>; onRemove: (reason: string | null) => void;
  adherence: number | null; heightCm: number | null; sex: Sex | null;
}) {
  const e = useWatch({ control, name: `therapy.${index}` }) as EpisodeForm | undefined;
  const [confirming, setConfirming] = useState(false);
  if (!e) return null;
  const base = `therapy.${index}` as const;
  const modality = e.modality as TherapyModality | null;
  const table = modality ? MODALITY_TABLES[modality] : null;
  let checks: ReturnType<typeof checkTherapyEpisode> | null = null;
  try { checks = modality ? checkTherapyEpisode(e as Parameters<typeof checkTherapyEpisode>[0]) : null; } catch { checks = null; }
  const warnOf = (f: string) => checks?.warnings.filter((w) => w.path === f).map((w) => <p key={w.message}>{w.detail} <strong className="font-semibold">{w.caution}</strong></p>);
  const field = (f: TherapyFieldName, extra: { hint?: string; options?: readonly string[] } = {}) => {
    const unit = modality && TABLE_FIELDS.has(f) ? MODALITY_TABLES[modality].numeric[f as NumericEpisodeField]?.unit : undefined;
    const w = warnOf(f);
    return (
      <SchemaField key={f} control={control} name={`${base}.${f}` as Path<CaseFormValues>} schema={THERAPY_FIELDS[f]} unit={unit}
        hint={extra.hint ?? (modality && TABLE_FIELDS.has(f) ? rangeHint(modality, f as NumericEpisodeField) : undefined)}
        warning={w && w.length ? w : undefined} options={extra.options} />
    );
  };
  const changeModality = (v: string | null) => {
    if (!v) return;
    const t = MODALITY_TABLES[v as TherapyModality];
    // Settings that do not apply to the new modality are cleared (the server would refuse them).
    for (const f of TherapyEpisodeFieldSchema.options) if (!t.fields.includes(f as TherapyEpisodeField)) setValue(`${base}.${f}` as Path<CaseFormValues>, null as never, { shouldDirty: true });
    for (const [f, val] of Object.entries(modalityDefaults(v as TherapyModality))) {
      if ((e as Record<string, unknown>)[f] == null) setValue(`${base}.${f}` as Path<CaseFormValues>, val as never, { shouldDirty: true });
    }
  };
  let pbw: number | null = null;
  try { pbw = heightCm != null && sex ? predictedBodyWeight(heightCm, sex) : null; } catch { pbw = null; }
  let indication: ReturnType<typeof lungExpansionIndication> | null = null;
  try {
    indication = heightCm != null && sex && (e.inspiratoryCapacityMl != null || e.vitalCapacityMl != null)
      ? lungExpansionIndication({ inspiratoryCapacityMl: e.inspiratoryCapacityMl, vitalCapacityMl: e.vitalCapacityMl, heightCm, sex }) : null;
  } catch { indication = null; }
  const showField = (f: TherapyEpisodeField) => table?.fields.includes(f);
  return (
    <li className="@container rounded border border-line bg-panel p-3">
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-base font-semibold">Episode {index + 1}{table ? `: ${table.label}` : ''}</h3>
        <div className="flex items-center gap-3 text-sm">
          <span className="tabular">Adherence <strong>{pct(adherence)}</strong></span>
          <Button type="button" variant="ghost" onClick={() => (e.recordId ? setConfirming(true) : onRemove(null))}>Remove episode</Button>
        </div>
      </div>
      {confirming && <RemoveWithReason what={`episode ${index + 1}`} onConfirm={(r) => onRemove(r)} onCancel={() => setConfirming(false)} />}
      <div className="grid gap-3 @md:grid-cols-2 @xl:grid-cols-3">
        <SchemaField control={control} name={`${base}.modality` as Path<CaseFormValues>} schema={THERAPY_FIELDS.modality} onValue={changeModality}
          hint="CPAP for obstructive sleep apnoea is a risk factor on the patient, not an episode." />
        {modality && (
          <>
            {field('startPostoperativeDay', { hint: 'Day 0 is the day of surgery.' })}
            {GENERAL_AFTER.map((f) => field(f))}
            {field('sessionsPrescribed')}
            {field('sessionsDelivered')}
            {e.sessionsDelivered != null && e.sessionsPrescribed != null && e.sessionsDelivered > e.sessionsPrescribed && field('deliveredAbovePrescribedReason')}
            {field('sessionMinutes')}
            {showField('interface') && field('interface', { options: table!.interfaces })}
            {(['noseClip', 'aerosolMedication', 'sourceGas', 'flowLpm', 'expiratoryPressureCmH2O', 'volumeTargetMl', 'inspiratoryCapacityMl', 'vitalCapacityMl', 'predictedBodyWeightKg'] as const).filter(showField).map((f) => field(f))}
          </>
        )}
      </div>
      {modality && showField('predictedBodyWeightKg') && (
        <div className="mt-2 text-sm">
          {pbw != null ? (
            <p>Predicted body weight from the patient's height and sex: <strong className="tabular">{pbw.toFixed(1)} kg</strong> (ARDS Network formula).{' '}
              {e.predictedBodyWeightKg == null && <Button type="button" variant="ghost" className="px-0" onClick={() => setValue(`${base}.predictedBodyWeightKg` as Path<CaseFormValues>, Math.round(pbw! * 10) / 10 as never, { shouldDirty: true })}>Use {pbw.toFixed(1)} kg</Button>}
            </p>
          ) : <p className="text-muted">Enter height and sex (patient section) to see the predicted body weight.</p>}
        </div>
      )}
      {indication && (
        <div className={`mt-2 rounded border-l-4 p-2 text-sm ${indication.incentiveSpirometryLikelyInadequate ? 'border-ochre bg-warn-soft' : 'border-line bg-surface'}`} role="status">
          <p className="font-semibold">Indication check (volumes per kg of predicted body weight, {indication.predictedBodyWeightKg.toFixed(1)} kg)</p>
          <ul className="list-disc pl-5">{indication.criteria.map((c) => <li key={c.id}>{c.reason} <span className="text-xs text-muted">({c.source})</span></li>)}</ul>
          {indication.message && <p className="mt-1">{indication.message}</p>}
          <p className="mt-1 font-semibold">{indication.caution}</p>
        </div>
      )}
      {modality && (
        <>
          <div className="mt-3 grid gap-3 @md:grid-cols-2">
            {field('tolerance')}
            {field('stopReason')}
            <div className="@md:col-span-2">{field('adverseEvents')}</div>
            {e.adverseEvents?.includes('other') && <div className="@md:col-span-2">{field('adverseEventNote')}</div>}
          </div>
          <details className="mt-2 text-xs text-muted">
            <summary className="cursor-pointer">About {table!.label}: notes and sources</summary>
            <ul className="list-disc pl-5">{table!.notes.map((n) => <li key={n}>{n}</li>)}</ul>
            <p className="mt-1">Sources: {table!.sources.join('; ')}</p>
          </details>
        </>
      )}
      {checks && checks.warnings.length > 0 && <p className="mt-2 text-xs text-ochre">{checks.warnings.length} setting{checks.warnings.length === 1 ? '' : 's'} outside the usual range: stored with a warning. {CLINICAL_CAUTION}</p>}
    </li>
  );
}

export function TherapySection({ control, setValue, adherence, heightCm, sex, onRemoved }: {
  control: Control<CaseFormValues>; setValue: UseFormSetValue<CaseFormValues>; adherence: (number | null)[]; heightCm: number | null; sex: Sex | null; onRemoved: (r: Removal) => void;
}) {
  const { fields, append, remove } = useFieldArray({ control, name: 'therapy' });
  const list = useWatch({ control, name: 'therapy' });
  return (
    <div className="flex flex-col gap-3">
      <ClinicalCaution />
      {fields.length === 0 && <p className="text-sm text-muted">No episodes recorded. Add one for each modality given after surgery.</p>}
      <ol className="flex flex-col gap-3">
        {fields.map((f, i) => (
          <EpisodeCard key={f.id} control={control} index={i} setValue={setValue} adherence={adherence[i] ?? null} heightCm={heightCm} sex={sex}
            onRemove={(reason) => { const id = list?.[i]?.recordId; if (id && reason) onRemoved({ list: 'therapy', recordId: id, reason, label: `episode ${i + 1}` }); remove(i); }} />
        ))}
      </ol>
      <div><Button type="button" variant="secondary" onClick={() => append({ modality: null as never } as EpisodeForm)}>Add a therapy episode</Button></div>
    </div>
  );
}
