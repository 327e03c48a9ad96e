/**
 * Body parsing for the registry routes: like `parse` in server/http/route.ts, but an unknown
 * key is reported under its own name (`foo: is not a field ...`) so the 400 names each field.
 */
import type { z } from 'zod';
import { issuePath, type ErrorField } from '../../shared/api/error.js';
import { AppError } from '../http/errors.js';

export function validationError(fields: ErrorField[], where: string): AppError {
  const first = fields[0];
  return new AppError(400, 'validation_failed', `the ${where} has ${fields.length} problem${fields.length === 1 ? '' : 's'}${first ? `: ${first.path || 'value'} ${first.message}` : ''}`, {
    hint: 'correct the fields listed and send again; nothing was saved',
    fields,
  });
}

export function parseBody<S extends z.ZodType>(schema: S, input: unknown, where: string): z.infer<S> {
  const r = schema.safeParse(input ?? {});
  if (r.success) return r.data;
  const fields: ErrorField[] = [];
  for (const i of r.error.issues) {
    if (i.code === 'unrecognized_keys') {
      for (const k of i.keys) fields.push({ path: issuePath([...i.path, k]), message: 'is not a field of this form; remove it or check its spelling' });
    } else {
      fields.push({ path: issuePath(i.path), message: i.message });
    }
  }
  throw validationError(fields, where);
}
