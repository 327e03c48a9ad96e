/**
 * GET /api/worklist: an abstractor's to-do list over the cases of their sites.
 * - missing data: draft or complete cases that fail the completeness rules;
 * - follow-up due: 30-day windows closing within `dueWithinDays` without follow-up;
 * - follow-up overdue: windows closed without follow-up;
 * - awaiting verification: complete cases the signed-in user may verify (not their own,
 *   not ones they changed), oldest first, flagged when waiting longer than VERIFY_WAIT_DAYS.
 */
import { z } from 'zod';
import { CaseStatusSchema } from '../clinical/codes.js';

export const WorklistQuerySchema = z.strictObject({
  siteId: z.uuid().optional(),
  dueWithinDays: z.coerce.number().int().min(1).max(30).default(7),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type WorklistQuery = z.infer<typeof WorklistQuerySchema>;

export const WorklistItemSchema = z.object({
  id: z.uuid(),
  registryNumber: z.string(),
  siteCode: z.string(),
  status: CaseStatusSchema,
  surgeryDate: z.string(),
  followUpWindowEnd: z.string(),
  /** Missing fields (field paths) for the missing-data list. */
  missing: z.array(z.string()),
  /** Days since the case became complete (awaiting verification) or since the window closed. */
  days: z.number().nullable(),
  overdue: z.boolean(),
});
export type WorklistItem = z.infer<typeof WorklistItemSchema>;

const bucket = z.object({ total: z.number().int(), items: z.array(WorklistItemSchema) });

export const WorklistSchema = z.object({
  today: z.string(),
  missingData: bucket,
  followUpDue: bucket,
  followUpOverdue: bucket,
  awaitingVerification: bucket,
});
export type Worklist = z.infer<typeof WorklistSchema>;
