/**
 * The result shape of Alveolog's clinical record checks and the caution every therapy or
 * threshold warning carries (surveillance and quality improvement only).
 */
import { z } from 'zod';

/** Shown with every warning about therapy settings or clinical thresholds. */
export const CLINICAL_CAUTION =
  "Local protocol and the clinician's judgement decide; Alveolog supports surveillance, not bedside decisions.";

/** A value that cannot be stored: what is wrong (`message`) and how to fix it (`hint`). */
export const CheckErrorSchema = z.object({ path: z.string(), message: z.string(), hint: z.string() });
export type CheckError = z.infer<typeof CheckErrorSchema>;

/**
 * A value that can be stored but deserves a second look. `message` is the full sentence shown
 * (`detail` followed by `caution`); the parts are kept apart for screens that lay them out.
 */
export const CheckWarningSchema = z.object({
  path: z.string(),
  message: z.string(),
  detail: z.string(),
  caution: z.string(),
});
export type CheckWarning = z.infer<typeof CheckWarningSchema>;

/** A data-consistency warning (not about therapy or clinical thresholds, so no caution). */
export const ConsistencyWarningSchema = z.object({ path: z.string(), message: z.string() });
export type ConsistencyWarning = z.infer<typeof ConsistencyWarningSchema>;

export const ConsistencyResultSchema = z.object({
  errors: z.array(CheckErrorSchema),
  warnings: z.array(ConsistencyWarningSchema),
});
export type ConsistencyResult = z.infer<typeof ConsistencyResultSchema>;

export const CheckResultSchema = z.object({
  errors: z.array(CheckErrorSchema),
  warnings: z.array(CheckWarningSchema),
});
export type CheckResult = z.infer<typeof CheckResultSchema>;

/** Builds a warning that carries the caution. */
export function cautionWarning(path: string, detail: string, caution: string = CLINICAL_CAUTION): CheckWarning {
  return { path, detail, caution, message: `${detail} ${caution}` };
}
