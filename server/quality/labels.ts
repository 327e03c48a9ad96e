/** Labels and sections of the completeness field paths (`age`, `therapy.<field>`, `outcomes.<field>`). */
import type { z } from 'zod';
import { CASE_FIELDS, type CaseFieldName } from '../../shared/registry/case.js';
import type { CompletenessSection } from '../../shared/registry/completeness.js';
import { fieldMeta } from '../../shared/registry/meta.js';
import { OUTCOME_FIELDS } from '../../shared/registry/outcome.js';
import { THERAPY_FIELDS } from '../../shared/registry/therapy.js';

/** `therapy.<uuid>.field` -> `therapy.field` (a case counts once per field). */
export const FIELD_PATH_SQL = `regexp_replace(f, '^(therapy|outcomes)\\.[0-9a-f-]{36}\\.', '\\1.')`;

export function completenessFieldInfo(path: string): { label: string; section: CompletenessSection } {
  if (path === 'therapy.episodes') return { label: 'Therapy episode recorded (therapy given)', section: 'therapy' };
  const [head, rest] = path.split('.', 2);
  if (head === 'therapy' && rest) {
    const sch = (THERAPY_FIELDS as unknown as Record<string, z.ZodType | undefined>)[rest];
    const m = sch ? fieldMeta(sch) : undefined;
    return { label: `Therapy episode: ${m?.label ?? rest}`, section: 'therapy' };
  }
  if (head === 'outcomes' && rest) {
    const sch = (OUTCOME_FIELDS as unknown as Record<string, z.ZodType | undefined>)[rest];
    const m = sch ? fieldMeta(sch) : undefined;
    return { label: `Outcome event: ${m?.label ?? rest}`, section: 'outcomes' };
  }
  const sch = CASE_FIELDS[path as CaseFieldName] as z.ZodType | undefined;
  const m = sch ? fieldMeta(sch) : undefined;
  const s = m?.section;
  return { label: m?.label ?? path, section: s && s !== 'registry' ? s : 'patient' };
}
