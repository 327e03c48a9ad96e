/**
 * What the server answers for one case (GET /api/cases/:id and every write), its audit trail,
 * and the shared warning shape.
 */
import { z } from 'zod';
import { CaseStatusSchema } from '../clinical/codes.js';
import { AriscatResultSchema } from '../clinical/scores.js';
import { CaseFieldsSchema } from './case.js';
import { COMPLETENESS_SECTIONS } from './completeness.js';
import { OutcomeEventSchema } from './outcome.js';
import { TherapyEpisodeSchema } from './therapy.js';

/** A warning the server stores with the record or returns with a save: it does not block. */
export const RegistryWarningSchema = z.object({ path: z.string(), code: z.string(), message: z.string() });
export type RegistryWarning = z.infer<typeof RegistryWarningSchema>;

export const CompletenessSchema = z.object({
  complete: z.boolean(),
  missing: z.array(z.object({ section: z.enum(COMPLETENESS_SECTIONS as [string, ...string[]]), field: z.string(), message: z.string() })),
  sections: z.record(z.string(), z.number()),
});

export const CaseDerivedSchema = z.object({
  bmi: z.number().nullable(),
  lengthOfStayDays: z.number().nullable(),
  postoperativeStayDays: z.number().nullable(),
  surveillanceMonth: z.string(),
  followUpWindowEnd: z.string(),
  followUpClosed: z.boolean(),
  daysToFirstTherapy: z.number().nullable(),
  anyPpc: z.boolean(),
  pneumoniaNhsn: z.boolean(),
  reintubation: z.boolean(),
  ards: z.boolean(),
  countsInAnalysis: z.boolean(),
});
export type CaseDerived = z.infer<typeof CaseDerivedSchema>;

export const CaseSchema = CaseFieldsSchema.extend({
  id: z.uuid(),
  registryNumber: z.string(),
  siteId: z.uuid(),
  siteCode: z.string(),
  status: CaseStatusSchema,
  version: z.number().int(),
  ariscat: AriscatResultSchema.nullable(),
  derived: CaseDerivedSchema,
  completeness: CompletenessSchema,
  /** An identifier was typed for this case (its keyed hash is stored; the identifier never is). */
  hasLocalIdentifier: z.boolean(),
  /** Registry numbers of other cases of the same patient (same keyed hash) at this site. */
  otherCasesOfPatient: z.array(z.string()),
  possibleDuplicate: z.boolean(),
  createdVia: z.enum(['form', 'import']),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  verifiedBy: z.string().nullable(),
  verifiedAt: z.string().nullable(),
  lockedAt: z.string().nullable(),
  withdrawnReason: z.string().nullable(),
  /** Whether the signed-in user may verify this case now, and if not why. */
  canVerify: z.object({ allowed: z.boolean(), reason: z.string().nullable() }),
  therapy: z.array(TherapyEpisodeSchema),
  outcomes: z.array(OutcomeEventSchema),
  warnings: z.array(RegistryWarningSchema),
});
export type Case = z.infer<typeof CaseSchema>;

export const CaseAuditEntrySchema = z.object({
  id: z.string(),
  at: z.string(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  field: z.string().nullable(),
  oldValue: z.string().nullable(),
  newValue: z.string().nullable(),
  reason: z.string().nullable(),
});
export type CaseAuditEntry = z.infer<typeof CaseAuditEntrySchema>;

export const CaseAuditQuerySchema = z.strictObject({
  /** Include the "case-read" entries (left out by default: they are many). */
  includeReads: z.enum(['true', 'false']).optional().transform((v) => v === 'true'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(200),
});
