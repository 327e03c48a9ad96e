/** Query pieces shared by the data-quality routes. */
import { z } from 'zod';

/** A surveillance month, YYYY-MM. */
export const MonthSchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'enter the month as YYYY-MM (e.g. 2025-03)');

/** One site or a list of sites in a query string: `a,b` or repeated. */
export const SiteListSchema = z.preprocess((v) => {
  if (v === undefined || v === '') return undefined;
  const arr = Array.isArray(v) ? v : [v];
  return arr.flatMap((s) => String(s).split(',')).map((s) => s.trim()).filter(Boolean);
}, z.array(z.uuid('a site id is not valid')).min(1).max(50).optional());

export const MonthRangeQuerySchema = z
  .strictObject({
    siteId: SiteListSchema,
    from: MonthSchema.optional(),
    to: MonthSchema.optional(),
  })
  .superRefine((q, ctx) => {
    if (q.from && q.to && q.from > q.to) ctx.addIssue({ code: 'custom', path: ['to'], message: 'the last month is before the first month' });
  });
export type MonthRangeQuery = z.infer<typeof MonthRangeQuerySchema>;

/** Written beside quality figures: they support surveillance, not bedside decisions. */
export const QUALITY_CAUTION =
  'Data-quality figures support surveillance and quality improvement only, not bedside decisions; local protocol and the clinician\u2019s judgement decide.';
