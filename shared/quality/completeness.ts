/**
 * GET /api/quality/completeness: per site and month, built on the registry's one completeness
 * query (the `case_completeness` view): share of cases with every required field, per section
 * and per field; closed follow-up windows without follow-up; cases waiting for verification
 * longer than VERIFY_WAIT_DAYS; the trend over months.
 *
 * Population: every case that is not withdrawn (drafts included: a draft still missing data is
 * exactly what a data-quality page should show). A therapy or outcome field counts a case once
 * however many of its episodes or events miss it (`therapy.<field>`, `outcomes.<field>`).
 */
import { z } from 'zod';
import { COMPLETENESS_SECTIONS } from '../registry/completeness.js';
import { MonthSchema, SiteListSchema } from './common.js';

export const CompletenessQuerySchema = z
  .strictObject({
    siteId: SiteListSchema,
    /** The month shown in detail; default: the latest month with cases. */
    month: MonthSchema.optional(),
    /** Months in the trend, ending with `month`. */
    months: z.coerce.number().int().min(1).max(36).default(12),
  });
export type CompletenessQuery = z.infer<typeof CompletenessQuerySchema>;

const Section = z.enum(COMPLETENESS_SECTIONS as unknown as [string, ...string[]]);

export const SectionCompletenessSchema = z.object({ section: Section, label: z.string(), complete: z.number().int(), share: z.number().nullable() });
export const FieldCompletenessSchema = z.object({ field: z.string(), label: z.string(), section: Section, missing: z.number().int(), share: z.number().nullable() });
export const TrendPointSchema = z.object({ month: z.string(), cases: z.number().int(), complete: z.number().int(), share: z.number().nullable() });
export const CaseRefSchema = z.object({ id: z.uuid(), registryNumber: z.string(), siteCode: z.string(), surgeryDate: z.string(), status: z.string(), days: z.number().int() });

export const CompletenessReportSchema = z.object({
  month: z.string().nullable(),
  today: z.string(),
  sites: z.array(z.object({ id: z.uuid(), code: z.string() })),
  cases: z.number().int(),
  complete: z.number().int(),
  share: z.number().nullable(),
  sections: z.array(SectionCompletenessSchema),
  fields: z.array(FieldCompletenessSchema),
  followUpOverdue: z.object({ total: z.number().int(), items: z.array(CaseRefSchema) }),
  verifyWaitDays: z.number().int(),
  awaitingVerification: z.object({ total: z.number().int(), items: z.array(CaseRefSchema) }),
  trend: z.array(TrendPointSchema),
});
export type CompletenessReport = z.infer<typeof CompletenessReportSchema>;
export type CaseRef = z.infer<typeof CaseRefSchema>;
