/**
 * Month close and the committee's monthly review: completeness, close / re-open (with a reason),
 * publish, findings per measure, actions with owner and due date, and the chair's sign-off.
 */
import { z } from 'zod';
import { MeasureKeySchema, MonthSchema } from './measures.js';

export const MonthParamSchema = z.object({ month: MonthSchema });

export const SiteCompletenessSchema = z.object({
  siteId: z.string().uuid(),
  siteCode: z.string(),
  siteName: z.string(),
  cases: z.number().int(),
  draft: z.number().int(),
  complete: z.number().int(),
  verified: z.number().int(),
  locked: z.number().int(),
  withdrawn: z.number().int(),
  /** Cases whose 30-day follow-up window has not ended yet. */
  windowsOpen: z.number().int(),
});
export type SiteCompleteness = z.infer<typeof SiteCompletenessSchema>;

export const MonthStateSchema = z.object({
  month: MonthSchema,
  closed: z.boolean(),
  closedAt: z.string().nullable(),
  closedBy: z.string().nullable(),
  publishedAt: z.string().nullable(),
  packetJobId: z.string().uuid().nullable(),
  reviewStatus: z.enum(['none', 'draft', 'signed']),
});
export type MonthState = z.infer<typeof MonthStateSchema>;

export const MonthDetailSchema = MonthStateSchema.extend({
  sites: z.array(SiteCompletenessSchema),
  totals: SiteCompletenessSchema.omit({ siteId: true, siteCode: true, siteName: true }),
  /** Whether the month has ended (a month still running cannot be closed). */
  ended: z.boolean(),
});
export type MonthDetail = z.infer<typeof MonthDetailSchema>;

export const ReasonBodySchema = z.strictObject({
  reason: z.string().trim().min(5, 'give the reason in a few words (it is kept in the audit trail)').max(500),
});

export const CloseResultSchema = z.object({ month: MonthSchema, locked: z.number().int(), notLocked: z.number().int(), signalsNotified: z.number().int() });
export type CloseResult = z.infer<typeof CloseResultSchema>;

export const FindingWriteSchema = z.strictObject({
  signalSeen: z.boolean({ error: 'say whether a signal was seen' }),
  discussion: z.string().trim().max(4000, 'keep the discussion under 4,000 characters').default(''),
});
export type FindingWrite = z.infer<typeof FindingWriteSchema>;

export const ActionCreateSchema = z.strictObject({
  measureKey: MeasureKeySchema,
  description: z.string().trim().min(5, 'describe the action in a few words').max(500),
  ownerId: z.string().uuid('choose the owner'),
  dueDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'use the form YYYY-MM-DD'),
});
export type ActionCreate = z.infer<typeof ActionCreateSchema>;

export const ActionUpdateSchema = z.strictObject({
  status: z.enum(['open', 'done']).optional(),
  dueDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'use the form YYYY-MM-DD').optional(),
  note: z.string().trim().max(500).optional(),
});
export type ActionUpdate = z.infer<typeof ActionUpdateSchema>;

export const ActionSchema = z.object({
  id: z.string().uuid(),
  month: MonthSchema,
  measureKey: MeasureKeySchema,
  description: z.string(),
  ownerId: z.string().uuid(),
  ownerName: z.string(),
  dueDate: z.string(),
  status: z.enum(['open', 'done']),
  overdue: z.boolean(),
  note: z.string().nullable(),
  createdAt: z.string(),
});
export type Action = z.infer<typeof ActionSchema>;

export const FindingSchema = z.object({
  measureKey: MeasureKeySchema,
  signalSeen: z.boolean(),
  discussion: z.string(),
  updatedBy: z.string().nullable(),
  updatedAt: z.string(),
});
export type Finding = z.infer<typeof FindingSchema>;

export const ReviewSchema = z.object({
  month: MonthSchema,
  status: z.enum(['none', 'draft', 'signed']),
  signedBy: z.string().nullable(),
  signedAt: z.string().nullable(),
  findings: z.array(FindingSchema),
  actions: z.array(ActionSchema),
});
export type Review = z.infer<typeof ReviewSchema>;

export const MemberSchema = z.object({ id: z.string().uuid(), displayName: z.string(), roles: z.array(z.string()) });
export type Member = z.infer<typeof MemberSchema>;
