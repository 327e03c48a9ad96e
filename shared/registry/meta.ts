/**
 * Data-dictionary metadata carried by each registry field schema (`.meta()`), so that the
 * dictionary page, its downloads and the completeness rules are generated from the same
 * schemas the form and the server validate with.
 */
import { z } from 'zod';

export const DictionarySectionSchema = z.enum(['registry', 'patient', 'operation', 'therapy', 'outcomes', 'follow-up']);
export type DictionarySection = z.infer<typeof DictionarySectionSchema>;
export const DICTIONARY_SECTION_LABELS: Record<DictionarySection, string> = {
  registry: 'Registry record',
  patient: 'Patient',
  operation: 'Operation',
  therapy: 'Lung-expansion therapy',
  outcomes: 'Outcomes',
  'follow-up': 'Follow-up',
};

export interface FieldMeta {
  /** Label shown beside the input and in the dictionary. */
  label: string;
  section: DictionarySection;
  /** Printed unit of the stored value (e.g. "g/dL", "min"). */
  unit?: string;
  /** Units accepted on entry when more than one (converted by shared/clinical/units.ts). */
  enteredUnits?: readonly string[];
  /** What the field records, in words. */
  definition: string;
  /** Published source of the definition or threshold, or "common practice (no source)". */
  source?: string;
  /** May leave the registry in a de-identified export. Default false: only reviewed fields are exportable. */
  exportable?: boolean;
  /** Free text: limited length, shown with the reminder not to enter identifiers. */
  freeText?: boolean;
  /** Labels of coded values, when the field is a code list. */
  valueLabels?: Readonly<Record<string, string>>;
}

/** Attaches dictionary metadata to a schema (read back by `fieldMeta`). */
export function described<S extends z.ZodType>(schema: S, meta: FieldMeta): S {
  return schema.meta(meta as unknown as Record<string, unknown>) as S;
}

/** Reads the metadata of a field schema, looking through optional/nullable/default wrappers. */
export function fieldMeta(schema: z.ZodType): FieldMeta | undefined {
  let s: z.ZodType | undefined = schema;
  for (let i = 0; s && i < 8; i++) {
    const m = s.meta() as unknown as FieldMeta | undefined;
    if (m?.label) return m;
    const def: { innerType?: z.ZodType; in?: z.ZodType } = (s as unknown as { def: { innerType?: z.ZodType; in?: z.ZodType } }).def;
    s = def.innerType ?? def.in;
  }
  return undefined;
}

/** The innermost schema under optional/nullable/default/pipe wrappers. */
export function innerSchema(schema: z.ZodType): z.ZodType {
  let s = schema;
  for (let i = 0; i < 8; i++) {
    const def: { type: string; innerType?: z.ZodType; in?: z.ZodType } = (s as unknown as { def: { type: string; innerType?: z.ZodType; in?: z.ZodType } }).def;
    const next: z.ZodType | undefined = def.innerType ?? (def.type === 'pipe' ? def.in : undefined);
    if (!next) return s;
    s = next;
  }
  return s;
}
