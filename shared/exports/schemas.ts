/**
 * Research export requests: what a researcher or analyst asks for, what the approver decides,
 * and what the API answers. Types are inferred from these schemas.
 */
import { z } from 'zod';
import { IsoDateSchema } from '../clinical/dates.js';
import { CohortFilterSchema } from '../analysis/cohort-filter.js';
import { KAnonymitySummarySchema } from './k-anonymity.js';

export const ExportFormatSchema = z.enum(['xlsx', 'csv'], { error: 'choose xlsx or csv' });
export type ExportFormat = z.infer<typeof ExportFormatSchema>;
export const ExportLevelSchema = z.enum(['deidentified', 'limited'], { error: 'choose a fully de-identified or a limited data set' });
export const EXPORT_LEVEL_LABELS = { deidentified: 'Fully de-identified (surgery year only)', limited: 'Limited data set (surgery year and month, under a data-use agreement)' } as const;
export const ExportKindSchema = z.enum(['rows', 'aggregate'], { error: 'choose row-level data or an aggregate table' });
export type ExportKind = z.infer<typeof ExportKindSchema>;

export const ExportStatusSchema = z.enum(['pending', 'declined', 'approved', 'generating', 'ready', 'failed', 'expired']);
export type ExportStatus = z.infer<typeof ExportStatusSchema>;
export const EXPORT_STATUS_LABELS: Record<ExportStatus, string> = {
  pending: 'Waiting for approval', declined: 'Declined', approved: 'Approved, queued', generating: 'Generating', ready: 'Ready to download', failed: 'Generation failed', expired: 'Expired (file deleted)',
};

/** The k-anonymity answer when the check finds small classes. */
export const RiskActionSchema = z.enum(['none', 'coarsen', 'suppress', 'coarsen-and-suppress'], { error: 'choose none, coarsen, suppress or coarsen-and-suppress' });
export type RiskAction = z.infer<typeof RiskActionSchema>;
export const RISK_ACTION_LABELS: Record<RiskAction, string> = {
  none: 'Generate as requested',
  coarsen: 'Coarsen: 20-year age bands instead of ages, year only, no unit codes',
  suppress: 'Suppress: leave out the records of classes under k',
  'coarsen-and-suppress': 'Coarsen, then leave out records still in classes under k',
};

const text = (min: number, max: number, what: string) => z.string({ error: `enter the ${what}` }).trim().min(min, `the ${what} needs at least ${min} characters`).max(max, `the ${what} is at most ${max} characters`);

export const DuaSchema = z.object({
  reference: text(3, 80, 'data-use agreement reference'),
  expiresOn: IsoDateSchema,
});

export const ExportRequestCreateSchema = z
  .strictObject({
    purpose: text(20, 2000, 'purpose'),
    cohort: CohortFilterSchema.default({}),
    kind: ExportKindSchema.default('rows'),
    /** Row-level: the variables (names from GET /api/exports/variables). */
    fields: z.array(z.string().max(80), { error: 'choose the fields as a list' }).max(200, 'choose at most 200 fields').default([]),
    /** Aggregate: one or two variables to count cases by. */
    rowsBy: z.string().max(80).optional(),
    colsBy: z.string().max(80).optional(),
    format: ExportFormatSchema,
    level: ExportLevelSchema.default('deidentified'),
    dua: DuaSchema.optional(),
    siteNamesRequested: z.boolean().default(false),
  })
  .superRefine((r, ctx) => {
    if (r.kind === 'rows' && r.fields.length === 0) ctx.addIssue({ code: 'custom', path: ['fields'], message: 'choose at least one field' });
    if (r.kind === 'aggregate' && !r.rowsBy) ctx.addIssue({ code: 'custom', path: ['rowsBy'], message: 'choose what to count cases by' });
    if (r.kind === 'aggregate' && r.rowsBy && r.rowsBy === r.colsBy) ctx.addIssue({ code: 'custom', path: ['colsBy'], message: 'choose a different variable for the columns' });
    if (r.level === 'limited' && !r.dua) ctx.addIssue({ code: 'custom', path: ['dua'], message: 'a limited data set needs the data-use agreement reference and its expiry date' });
  });
export type ExportRequestCreate = z.infer<typeof ExportRequestCreateSchema>;

export const ExportDecisionSchema = z
  .strictObject({
    decision: z.enum(['approve', 'decline'], { error: 'choose approve or decline' }),
    reason: text(5, 1000, 'reason'),
    siteNamesApproved: z.boolean().default(false),
    riskAction: RiskActionSchema.default('none'),
    /** Approve although the k-anonymity check found classes under k, without coarsening or suppressing. */
    acceptRisk: z.boolean().default(false),
  });
export type ExportDecision = z.infer<typeof ExportDecisionSchema>;

export const RiskReportSchema = z.object({
  quasiIdentifiers: z.array(z.string()),
  asRequested: KAnonymitySummarySchema,
  coarsened: KAnonymitySummarySchema,
  applies: z.boolean(),
  message: z.string(),
});
export type RiskReport = z.infer<typeof RiskReportSchema>;

export const ExportRequestViewSchema = z.object({
  id: z.uuid(),
  requester: z.object({ id: z.uuid(), displayName: z.string(), email: z.string() }),
  purpose: z.string(),
  cohort: CohortFilterSchema,
  kind: ExportKindSchema,
  fields: z.array(z.string()),
  rowsBy: z.string().nullable(),
  colsBy: z.string().nullable(),
  format: ExportFormatSchema,
  level: ExportLevelSchema,
  dua: DuaSchema.nullable(),
  siteNamesRequested: z.boolean(),
  status: ExportStatusSchema,
  decidedBy: z.string().nullable(),
  decidedAt: z.string().nullable(),
  decisionReason: z.string().nullable(),
  siteNamesApproved: z.boolean(),
  riskAction: RiskActionSchema,
  risk: KAnonymitySummarySchema.nullable(),
  jobId: z.uuid().nullable(),
  progress: z.record(z.string(), z.union([z.number(), z.string()])).nullable(),
  error: z.string().nullable(),
  file: z.object({ name: z.string(), bytes: z.number(), rows: z.number(), sheets: z.number() }).nullable(),
  expiresAt: z.string().nullable(),
  createdAt: z.string(),
  /** True when the signed-in user may download the file now. */
  canDownload: z.boolean(),
});
export type ExportRequestView = z.infer<typeof ExportRequestViewSchema>;

export const ExportListQuerySchema = z.object({
  scope: z.enum(['mine', 'all']).default('mine'),
  status: ExportStatusSchema.optional(),
});

export const ExportAuditQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  requestId: z.uuid().optional(),
});

export const ExportAuditEntrySchema = z.object({
  id: z.string(), at: z.string(), action: z.string(), actorEmail: z.string().nullable(), requestId: z.string().nullable(), reason: z.string().nullable(), details: z.record(z.string(), z.unknown()).nullable(),
});
export type ExportAuditEntry = z.infer<typeof ExportAuditEntrySchema>;

/** Audit actions written by the export area. */
export const EXPORT_AUDIT_ACTIONS = ['export-request', 'export-approve', 'export-decline', 'export-generate', 'export-generate-failed', 'export-download', 'export-download-refused', 'export-expire', 'export-audit-export'] as const;

/** The spreadsheet limit per sheet, header included (Office Open XML / Excel specifications and limits). */
export const XLSX_MAX_ROWS_PER_SHEET = 1_048_576;
