import { z } from 'zod';

/** The one error envelope every non-2xx JSON answer uses. */
export const ErrorFieldSchema = z.object({ path: z.string(), message: z.string() });
export const ErrorEnvelopeSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    hint: z.string().optional(),
    fields: z.array(ErrorFieldSchema),
    details: z.unknown().optional(),
  }),
});
export type ErrorField = z.infer<typeof ErrorFieldSchema>;
export type ErrorEnvelope = z.infer<typeof ErrorEnvelopeSchema>;

/** Turns a zod issue path into the dotted form shown to users (`episodes.0.flow`). */
export function issuePath(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join('.');
}
