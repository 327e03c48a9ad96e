/**
 * GET /api/cases: server-side pagination, sorting and filters, and the row shape of the list.
 * The answer is `{ items, total, page, pageSize }`; above 10,000 rows without filters the total
 * is the planner's estimate (`totalIsEstimate: true`) so the first page stays fast.
 */
import { z } from 'zod';
import { PageQuerySchema, pageSchema } from '../api/pagination.js';
import { CaseStatusSchema, PPC_EVENT_TYPES, PpcEventTypeSchema, ProcedureCategorySchema } from '../clinical/codes.js';
import { IsoDateSchema } from '../clinical/dates.js';
import { AriscatRiskClassSchema } from '../clinical/scores.js';

/** A query-string list: `a,b` or repeated `x=a&x=b`. */
function list<T extends z.ZodType>(item: T) {
  return z.preprocess((v) => {
    if (v === undefined || v === '') return undefined;
    const arr = Array.isArray(v) ? v : [v];
    return arr.flatMap((s) => String(s).split(',')).map((s) => s.trim()).filter(Boolean);
  }, z.array(item).min(1).max(50).optional());
}

export const CASE_SORT_FIELDS = ['registryNumber', 'surgeryDate', 'status', 'ariscatPoints', 'procedureCategory', 'age', 'updatedAt', 'siteCode'] as const;
export const CaseSortFieldSchema = z.enum(CASE_SORT_FIELDS);

export const OutcomeFilterSchema = z.union([z.enum(['any-ppc', 'no-ppc', 'pneumonia-nhsn']), PpcEventTypeSchema]);
export type OutcomeFilter = z.infer<typeof OutcomeFilterSchema>;
export const OUTCOME_FILTER_VALUES = ['any-ppc', 'no-ppc', 'pneumonia-nhsn', ...PPC_EVENT_TYPES] as const;

export const RiskClassFilterSchema = z.union([AriscatRiskClassSchema, z.literal('unscored')]);

export const CaseListQuerySchema = PageQuerySchema.extend({
  siteId: list(z.uuid('a site id in the filter is not valid')),
  surgeryFrom: IsoDateSchema.optional(),
  surgeryTo: IsoDateSchema.optional(),
  status: list(CaseStatusSchema),
  procedureCategory: list(ProcedureCategorySchema),
  riskClass: list(RiskClassFilterSchema),
  outcome: OutcomeFilterSchema.optional(),
  /** Registry number, or its beginning (e.g. `HBR-2025`). */
  q: z.string().trim().max(40).regex(/^[A-Za-z0-9-]*$/, 'search by registry number (letters, digits and dashes)').optional(),
})
  .strict()
  .superRefine((q, ctx) => {
    if (q.sort && !(CASE_SORT_FIELDS as readonly string[]).includes(q.sort.split('.')[0])) {
      ctx.addIssue({ code: 'custom', path: ['sort'], message: `sort by one of ${CASE_SORT_FIELDS.join(', ')}` });
    }
    if (q.surgeryFrom && q.surgeryTo && q.surgeryFrom > q.surgeryTo) {
      ctx.addIssue({ code: 'custom', path: ['surgeryTo'], message: 'the end of the date range is before its start' });
    }
  });
export type CaseListQuery = z.infer<typeof CaseListQuerySchema>;

/** Whether a list query narrows the rows beyond the user's own site scope. */
export function caseListIsFiltered(q: CaseListQuery): boolean {
  return !!(q.siteId || q.surgeryFrom || q.surgeryTo || q.status || q.procedureCategory || q.riskClass || q.outcome || q.q);
}

export const CaseListItemSchema = z.object({
  id: z.uuid(),
  registryNumber: z.string(),
  siteId: z.uuid(),
  siteCode: z.string(),
  unitCode: z.string().nullable(),
  status: CaseStatusSchema,
  surgeryDate: z.string(),
  procedureCategory: ProcedureCategorySchema.nullable(),
  age: z.number().nullable(),
  ariscatPoints: z.number().nullable(),
  ariscatClass: AriscatRiskClassSchema.nullable(),
  anyPpc: z.boolean(),
  eventTypes: z.array(PpcEventTypeSchema),
  complete: z.boolean(),
  version: z.number(),
  updatedAt: z.string(),
});
export type CaseListItem = z.infer<typeof CaseListItemSchema>;

export const CaseListPageSchema = pageSchema(CaseListItemSchema);
export type CaseListPage = z.infer<typeof CaseListPageSchema>;
