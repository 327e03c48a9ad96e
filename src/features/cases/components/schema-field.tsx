/**
 * Renders one registry field from its shared zod schema and dictionary metadata: the input kind
 * (number with unit, code list, yes/no, date, free text, measurement with units) comes from the
 * schema, the label, unit and definition from the metadata. No field rules are written here.
 */
import type { ReactNode } from 'react';
import type { Control, FieldValues, Path } from 'react-hook-form';
import type { z } from 'zod';
import { UNIT_LABELS } from '../../../../shared/clinical/units.js';
import { fieldMeta, innerSchema } from '../../../../shared/registry/meta.js';
import { FREE_TEXT_REMINDER } from '../../../../shared/registry/text.js';
import { CheckListField, DateField, MeasurementField, NumberField, SelectField, TextField, YesNoField } from './fields.js';

export interface SchemaFieldProps<T extends FieldValues> {
  control: Control<T>;
  name: Path<T>;
  schema: z.ZodType;
  /** Overrides the metadata's unit (e.g. the modality table's unit). */
  unit?: string;
  hint?: ReactNode;
  warning?: ReactNode;
  className?: string;
  /** Limit a code list (e.g. the interfaces that fit a modality). */
  options?: readonly string[];
  onValue?: (v: string | null) => void;
}

type Def = { type: string; format?: string; element?: z.ZodType };

export function SchemaField<T extends FieldValues>({ control, name, schema, unit, hint, warning, className, options, onValue }: SchemaFieldProps<T>) {
  const meta = fieldMeta(schema);
  const label = meta?.label ?? String(name);
  const inner = innerSchema(schema);
  const def = (inner as unknown as { def: Def }).def;
  const u = unit ?? (meta?.unit && !meta.unit.startsWith('date') ? meta.unit : undefined);
  const common = { control, name, label, hint, warning, className };
  if (meta?.enteredUnits) {
    return <MeasurementField {...common} units={meta.enteredUnits} unitLabels={UNIT_LABELS as Record<string, string>} hint={hint ?? `Stored in ${meta.unit}; enter it in the unit the laboratory reported.`} />;
  }
  switch (def.type) {
    case 'boolean':
      return <YesNoField {...common} />;
    case 'number':
      return <NumberField {...common} unit={u} />;
    case 'enum':
      return <SelectField {...common} unit={u} options={options ?? (inner as unknown as { options: string[] }).options} labels={meta?.valueLabels} onValue={onValue} />;
    case 'array': {
      const el = innerSchema(def.element!) as unknown as { options?: string[] };
      return <CheckListField {...common} options={el.options ?? []} labels={meta?.valueLabels ?? {}} />;
    }
    case 'string':
      if (def.format === 'date') return <DateField {...common} />;
      if (meta?.freeText) return <TextField {...common} multiline hint={<>{hint ? <>{hint} </> : null}<strong className="font-semibold text-ochre">{FREE_TEXT_REMINDER}</strong></>} />;
      return <TextField {...common} />;
    default:
      return <TextField {...common} />;
  }
}
