/**
 * Checks a column mapping against the sheets found in the upload: every header is mapped to a
 * field of its sheet's kind or explicitly dropped (null), no field twice, required fields present.
 */
import { AppError } from '../http/errors.js';
import { IMPORT_COLUMNS, SHEET_NAMES, columnOf } from '../../shared/imports/fields.js';
import type { Mapping, SheetInfo } from '../../shared/imports/api.js';
import type { ErrorField } from '../../shared/api/error.js';

/** Throws a 400 naming each sheet and column whose mapping is missing, unknown or doubled. */
export function checkMapping(sheets: readonly SheetInfo[], mapping: Mapping): void {
  const fields: ErrorField[] = [];
  for (const kind of Object.keys(mapping)) {
    if (!sheets.some((s) => s.kind === kind)) fields.push({ path: `mapping.${kind}`, message: `the file has no ${SHEET_NAMES[kind as keyof typeof SHEET_NAMES] ?? kind} sheet; remove this mapping` });
  }
  for (const s of sheets) {
    const m = mapping[s.kind] ?? {};
    const where = `sheet "${s.sheet}"`;
    for (const h of Object.keys(m)) if (!s.headers.includes(h)) fields.push({ path: `mapping.${s.kind}.${h}`, message: `${where} has no column "${h}"` });
    const used = new Map<string, string>();
    for (const h of s.headers) {
      if (!(h in m)) {
        fields.push({ path: `mapping.${s.kind}.${h}`, message: `${where}: column "${h}" is not mapped; choose the registry field it holds, or "drop" to leave it out` });
        continue;
      }
      const f = m[h];
      if (f === null) continue;
      if (!columnOf(s.kind, f)) {
        fields.push({ path: `mapping.${s.kind}.${h}`, message: `${where}: "${f}" is not a field of ${SHEET_NAMES[s.kind].toLowerCase()}` });
        continue;
      }
      if (used.has(f)) fields.push({ path: `mapping.${s.kind}.${h}`, message: `${where}: columns "${used.get(f)}" and "${h}" are both mapped to ${columnOf(s.kind, f)!.label}; keep one` });
      else used.set(f, h);
    }
    for (const c of IMPORT_COLUMNS[s.kind]) {
      if (c.required && !used.has(c.key)) fields.push({ path: `mapping.${s.kind}`, message: `${where}: no column is mapped to ${c.label}, which every row needs` });
    }
    if (s.kind !== 'cases' && !used.has('caseKey') && !used.has('registryNumber')) {
      fields.push({ path: `mapping.${s.kind}`, message: `${where}: map the case key or the registry case number column, so each row can be tied to its case` });
    }
  }
  if (fields.length) {
    throw new AppError(400, 'mapping_invalid', `the column mapping has ${fields.length} problem${fields.length === 1 ? '' : 's'}: ${fields[0].message}`, {
      hint: 'map every column to a registry field or drop it, then start the dry run again',
      fields,
    });
  }
}
