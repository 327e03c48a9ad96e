/**
 * Form inputs bound to react-hook-form with `useController`: each converts between what the
 * input shows (text) and the typed value the shared zod schema validates (number, boolean,
 * code or null), and carries its label, unit, hint, warning and error, wired for screen readers.
 */
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { useController, type Control, type FieldValues, type Path } from 'react-hook-form';
import { inputClass } from '../../../components/ui.js';

interface Common<T extends FieldValues> {
  control: Control<T>;
  name: Path<T>;
  label: string;
  hint?: ReactNode;
  /** A non-blocking note (e.g. outside the usual range), shown in the warning tone. */
  warning?: ReactNode;
  className?: string;
}

function Frame({ id, label, unit, hint, warning, error, children, className = '' }: { id: string; label: string; unit?: string; hint?: ReactNode; warning?: ReactNode; error?: string; children: ReactNode; className?: string }) {
  return (
    <div className={`flex min-w-0 flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-sm font-semibold">{label}{unit && !label.toLowerCase().includes(unit.toLowerCase()) && <span className="font-normal text-muted"> ({unit})</span>}</label>
      {children}
      {hint && !error && <p id={`${id}-hint`} className="text-xs text-muted">{hint}</p>}
      {warning && !error && <div id={`${id}-warn`} className="rounded border-l-4 border-ochre bg-warn-soft px-2 py-1 text-xs text-ink">{warning}</div>}
      {error && <p id={`${id}-error`} className="text-xs text-danger" role="alert">{error}</p>}
    </div>
  );
}

/**
 * Messages show once a field was left (touched) or a save was tried: a record just added is
 * not covered in "required" messages before the abstractor has reached its fields.
 */
const shown = (fs: { isTouched: boolean; error?: unknown }, form: { submitCount: number }) => fs.isTouched || form.submitCount > 0 || (fs.error as { type?: string } | undefined)?.type === 'server';

const describedBy = (id: string, hint: unknown, warning: unknown, error: unknown) =>
  [error ? `${id}-error` : hint ? `${id}-hint` : null, warning && !error ? `${id}-warn` : null].filter(Boolean).join(' ') || undefined;

/** A number with its unit; empty is null. Keeps the typed text so "36." can become "36.5". */
export function NumberField<T extends FieldValues>({ control, name, label, unit, hint, warning, step = 'any', className, placeholder, optional = false }: Common<T> & { unit?: string; step?: string; placeholder?: string; optional?: boolean }) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const [text, setText] = useState(field.value == null ? '' : String(field.value));
  const last = useRef<unknown>(field.value);
  useEffect(() => {
    // An outside change (reset, a default, a conflict choice) replaces the text.
    if (field.value !== last.current) {
      last.current = field.value;
      setText(field.value == null ? '' : String(field.value));
    }
  }, [field.value]);
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  return (
    <Frame id={id} label={label} unit={unit} hint={hint} warning={warning} error={error} className={className}>
      <input
        id={id} ref={field.ref} name={field.name} inputMode="decimal" type="text" step={step} placeholder={placeholder}
        className={`${inputClass} tabular ${error ? 'border-danger' : ''}`} value={text}
        aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, warning, error)}
        onBlur={field.onBlur}
        onChange={(e) => {
          const t = e.target.value;
          setText(t);
          const trimmed = t.trim().replace(',', '.');
          const v = trimmed === '' ? (optional ? undefined : null) : Number(trimmed);
          // Not-a-number is passed on as NaN so the schema names the problem ("enter a number").
          last.current = v;
          field.onChange(v);
        }}
      />
    </Frame>
  );
}

export function TextField<T extends FieldValues>({ control, name, label, hint, warning, className, type = 'text', maxLength, multiline, autoComplete = 'off', optional = false }: Common<T> & { type?: string; maxLength?: number; multiline?: boolean; autoComplete?: string; optional?: boolean }) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  const props = {
    id, ref: field.ref, name: field.name, value: (field.value as string | null | undefined) ?? '', maxLength, autoComplete,
    className: `${inputClass} ${error ? 'border-danger' : ''}`, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy(id, hint, warning, error),
    onBlur: field.onBlur,
    onChange: (e: { target: { value: string } }) => field.onChange(e.target.value === '' ? (optional ? undefined : null) : e.target.value),
  };
  return (
    <Frame id={id} label={label} hint={hint} warning={warning} error={error} className={className}>
      {multiline ? <textarea rows={2} {...props} /> : <input type={type} {...props} />}
    </Frame>
  );
}

export function DateField<T extends FieldValues>(p: Common<T> & { optional?: boolean }) {
  return <TextField {...p} type="date" />;
}

/** A code list as a select; empty is null. */
export function SelectField<T extends FieldValues>({ control, name, label, hint, warning, className, options, labels, empty = 'Not recorded', unit, onValue, optional = false }: Common<T> & { options: readonly string[]; labels?: Readonly<Record<string, string>>; empty?: string; unit?: string; onValue?: (v: string | null) => void; optional?: boolean }) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  return (
    <Frame id={id} label={label} unit={unit} hint={hint} warning={warning} error={error} className={className}>
      <select
        id={id} ref={field.ref} name={field.name} value={(field.value as string | null) ?? ''}
        className={`${inputClass} ${error ? 'border-danger' : ''}`} aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, warning, error)}
        onBlur={field.onBlur}
        onChange={(e) => { const v = e.target.value === '' ? (optional ? undefined : null) : e.target.value; field.onChange(v); onValue?.(v ?? null); }}
      >
        <option value="">{empty}</option>
        {options.map((o) => <option key={o} value={o}>{labels?.[o] ?? o}</option>)}
      </select>
    </Frame>
  );
}

/** Yes / no / not recorded as a radio group (arrow keys move within it). */
export function YesNoField<T extends FieldValues>({ control, name, label, hint, warning, className }: Common<T>) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  const v = field.value as boolean | null | undefined;
  const opt = (value: boolean | null, text: string) => (
    <label className="flex items-center gap-1 text-sm">
      <input type="radio" name={`${id}-radio`} checked={v === value || (value === null && v == null)} onChange={() => field.onChange(value)} onBlur={field.onBlur} ref={value === true ? field.ref : undefined} />
      {text}
    </label>
  );
  return (
    <fieldset className={`flex min-w-0 flex-col gap-1 ${className ?? ''}`} aria-describedby={describedBy(id, hint, warning, error)} aria-invalid={error ? true : undefined}>
      <legend className="mb-1 text-sm font-semibold">{label}</legend>
      <div className="flex flex-wrap gap-x-4 gap-y-1">{opt(true, 'Yes')}{opt(false, 'No')}{opt(null, 'Not recorded')}</div>
      {hint && !error && <p id={`${id}-hint`} className="text-xs text-muted">{hint}</p>}
      {warning && !error && <div id={`${id}-warn`} className="rounded border-l-4 border-ochre bg-warn-soft px-2 py-1 text-xs">{warning}</div>}
      {error && <p id={`${id}-error`} className="text-xs text-danger" role="alert">{error}</p>}
    </fieldset>
  );
}

/** A measurement entered in one of several units (e.g. haemoglobin in g/dL or g/L); empty is null. */
export function MeasurementField<T extends FieldValues>({ control, name, label, hint, warning, className, units, unitLabels }: Common<T> & { units: readonly string[]; unitLabels: Readonly<Record<string, string>> }) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const m = field.value as { value: number; unit: string } | null | undefined;
  const [text, setText] = useState(m?.value == null ? '' : String(m.value));
  const [unit, setUnit] = useState(m?.unit ?? units[0]);
  const last = useRef<unknown>(m);
  useEffect(() => {
    if (field.value !== last.current) {
      last.current = field.value;
      const n = field.value as typeof m;
      setText(n?.value == null ? '' : String(n.value));
      if (n?.unit) setUnit(n.unit);
    }
  }, [field.value]);
  const emit = (t: string, u: string) => {
    const trimmed = t.trim().replace(',', '.');
    const next = trimmed === '' ? null : { value: Number(trimmed), unit: u };
    last.current = next;
    field.onChange(next);
  };
  const fe = fieldState.error as unknown as { message?: string; value?: { message?: string }; unit?: { message?: string } } | undefined;
  const error = shown(fieldState, formState) ? fe?.message ?? fe?.value?.message ?? fe?.unit?.message : undefined;
  return (
    <Frame id={id} label={label} hint={hint} warning={warning} error={error} className={className}>
      <div className="flex gap-1">
        <input id={id} ref={field.ref} inputMode="decimal" className={`${inputClass} tabular min-w-0 flex-1 ${error ? 'border-danger' : ''}`} value={text}
          aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, warning, error)} onBlur={field.onBlur}
          onChange={(e) => { setText(e.target.value); emit(e.target.value, unit); }} />
        <select aria-label={`${label}: unit`} className={inputClass} value={unit} onChange={(e) => { setUnit(e.target.value); emit(text, e.target.value); }}>
          {units.map((u) => <option key={u} value={u}>{unitLabels[u] ?? u}</option>)}
        </select>
      </div>
    </Frame>
  );
}

/** A list of codes as checkboxes (e.g. therapy adverse events); empty list is null. */
export function CheckListField<T extends FieldValues>({ control, name, label, hint, className, options, labels }: Common<T> & { options: readonly string[]; labels: Readonly<Record<string, string>> }) {
  const id = useId();
  const { field, fieldState, formState } = useController({ control, name });
  const cur = (field.value as string[] | null | undefined) ?? [];
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  return (
    <fieldset className={`flex min-w-0 flex-col gap-1 ${className ?? ''}`} aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1 text-sm font-semibold">{label}</legend>
      <div className="flex flex-wrap gap-x-4 gap-y-1">
        {options.map((o) => (
          <label key={o} className="flex items-center gap-1 text-sm">
            <input type="checkbox" checked={cur.includes(o)} onBlur={field.onBlur}
              onChange={() => { const next = cur.includes(o) ? cur.filter((x) => x !== o) : [...cur, o]; field.onChange(next.length ? next : null); }} />
            {labels[o] ?? o}
          </label>
        ))}
      </div>
      {hint && !error && <p className="text-xs text-muted">{hint}</p>}
      {error && <p id={`${id}-error`} className="text-xs text-danger" role="alert">{error}</p>}
    </fieldset>
  );
}

/** A plain checkbox for a required yes/no inside an observation (unticked = no). */
export function CheckboxField<T extends FieldValues>({ control, name, label, className }: Common<T>) {
  const { field, fieldState, formState } = useController({ control, name });
  const error = shown(fieldState, formState) ? fieldState.error?.message : undefined;
  return (
    <div className={`flex min-w-0 flex-col justify-end gap-1 ${className ?? ''}`}>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" ref={field.ref} checked={field.value === true} onBlur={field.onBlur} onChange={(e) => field.onChange(e.target.checked)} />
        {label}
      </label>
      {error && <p className="text-xs text-danger" role="alert">{error}</p>}
    </div>
  );
}
