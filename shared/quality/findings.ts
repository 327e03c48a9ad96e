/**
 * Definition consistency: a check over the registry that lists contradictions, each linked to
 * its case, each markable as reviewed with a reason (audited). Kinds:
 * - pneumonia-not-met: a respiratory-infection event whose observations do not meet CDC/NHSN PNU1;
 * - pneumonia-unrecorded: another event's observations meet PNU1 but the case has no
 *   respiratory-infection event;
 * - pneumonia-flag-stale: the stored PNU1 result differs from evaluating the observations now;
 * - therapy-range: an episode outside its modality's possible or usual ranges (checkTherapyEpisode);
 * - los-outlier: post-operative stay above Q3 + 3 x IQR of its procedure category (cases that
 *   count in analyses, categories with at least 8 such cases; "far out" in Tukey's sense,
 *   Tukey JW, Exploratory Data Analysis 1977);
 * - duplicate-suspect: two or more cases of a site with the same keyed hash and surgery date.
 */
import { z } from 'zod';
import { ReasonSchema } from '../registry/text.js';
import { SiteListSchema } from './common.js';

export const FINDING_KINDS = ['pneumonia-not-met', 'pneumonia-unrecorded', 'pneumonia-flag-stale', 'therapy-range', 'los-outlier', 'duplicate-suspect'] as const;
export const FindingKindSchema = z.enum(FINDING_KINDS);
export type FindingKind = z.infer<typeof FindingKindSchema>;
export const FINDING_KIND_LABELS: Record<FindingKind, string> = {
  'pneumonia-not-met': 'Pneumonia recorded, PNU1 not met',
  'pneumonia-unrecorded': 'PNU1 met, pneumonia not recorded',
  'pneumonia-flag-stale': 'Stored PNU1 result out of date',
  'therapy-range': 'Therapy outside plausible range',
  'los-outlier': 'Length-of-stay outlier',
  'duplicate-suspect': 'Duplicate suspect',
};
/** The LOS rule, stated once for the screen and the job. */
export const LOS_RULE = { multiplier: 3, minCases: 8, text: 'post-operative stay above Q3 + 3 × IQR of its procedure category (cases that count in analyses; categories with at least 8 cases)' } as const;

export const FindingStatusSchema = z.enum(['open', 'reviewed', 'resolved']);

export const CheckRunSchema = z.strictObject({ siteIds: z.array(z.uuid('a site id is not valid')).min(1).max(50).optional() });

export const FindingListQuerySchema = z.strictObject({
  siteId: SiteListSchema,
  kind: FindingKindSchema.optional(),
  status: FindingStatusSchema.optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type FindingListQuery = z.infer<typeof FindingListQuerySchema>;

export const FindingSchema = z.object({
  id: z.uuid(),
  kind: FindingKindSchema,
  caseId: z.uuid(),
  registryNumber: z.string(),
  siteCode: z.string(),
  message: z.string(),
  details: z.record(z.string(), z.unknown()),
  status: FindingStatusSchema,
  firstFoundAt: z.string(),
  lastFoundAt: z.string(),
  reviewedByEmail: z.string().nullable(),
  reviewedAt: z.string().nullable(),
  reviewReason: z.string().nullable(),
});
export type Finding = z.infer<typeof FindingSchema>;

export const FindingPageSchema = z.object({
  items: z.array(FindingSchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
  counts: z.record(z.string(), z.number().int()),
  lastRun: z.object({ jobId: z.uuid(), at: z.string(), status: z.string() }).nullable(),
});
export type FindingPage = z.infer<typeof FindingPageSchema>;

export const FindingReviewSchema = z.strictObject({ reason: ReasonSchema });
