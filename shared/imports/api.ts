/**
 * Bulk import requests and answers: upload options, the column mapping, dry-run counts and
 * problems, commit options, history and mapping presets.
 */
import { z } from 'zod';
import { RECORD_KINDS } from './fields.js';

export const RecordKindSchema = z.enum(RECORD_KINDS);
export const DecimalSeparatorSchema = z.enum(['point', 'comma']);
export type DecimalSeparator = z.infer<typeof DecimalSeparatorSchema>;
export const ExistingPolicySchema = z.enum(['skip', 'update']);
export type ExistingPolicy = z.infer<typeof ExistingPolicySchema>;

/** Multipart fields sent with the file (POST /api/imports). */
export const UploadOptionsSchema = z.strictObject({
  siteId: z.uuid('choose the site the rows belong to'),
  decimal: DecimalSeparatorSchema.default('point'),
  /** What a CSV file (or a one-sheet workbook with another sheet name) holds. */
  kind: RecordKindSchema.default('cases'),
});
export type UploadOptions = z.infer<typeof UploadOptionsSchema>;

/** One sheet's headers as found in the file, each mapped to a field, or null to drop the column. */
export const SheetMappingSchema = z.record(z.string(), z.string().nullable());
/** The mapping of every recognised sheet: kind -> header -> field | null. */
export const MappingSchema = z.partialRecord(RecordKindSchema, SheetMappingSchema);
export type Mapping = z.infer<typeof MappingSchema>;

/** POST /api/imports/:id/dry-run: the mapping to use, and optionally save it as a site preset. */
export const DryRunRequestSchema = z.strictObject({
  mapping: MappingSchema,
  savePresetAs: z.string().trim().min(1, 'name the preset').max(60, 'keep the preset name under 60 characters').optional(),
});
export type DryRunRequest = z.infer<typeof DryRunRequestSchema>;

/** POST /api/imports/:id/commit. */
export const CommitRequestSchema = z.strictObject({
  existing: ExistingPolicySchema,
  /** The same file (same hash) was imported before: import it again anyway. */
  confirmReupload: z.boolean().optional(),
});
export type CommitRequest = z.infer<typeof CommitRequestSchema>;

export const ProblemSchema = z.object({
  sheet: z.string(),
  /** Spreadsheet row number (1 = header row), or null for a problem with the whole sheet. */
  row: z.number().int().nullable(),
  /** Header text of the column in the file, or null. */
  column: z.string().nullable(),
  /** Column letter (A, B, ... AA) when known. */
  cell: z.string().nullable(),
  field: z.string().nullable(),
  /** The offending value as text, never for the identifier column, shortened. */
  value: z.string().nullable(),
  message: z.string(),
  hint: z.string(),
  severity: z.enum(['error', 'warning']),
});
export type Problem = z.infer<typeof ProblemSchema>;

export const KindCountsSchema = z.object({ rows: z.number(), new: z.number(), updated: z.number(), unchanged: z.number(), rejected: z.number() });
export type KindCounts = z.infer<typeof KindCountsSchema>;
export const ImportCountsSchema = z.object({
  rows: z.number(), new: z.number(), updated: z.number(), unchanged: z.number(), rejected: z.number(),
  warnings: z.number(), duplicates: z.number(),
  byKind: z.partialRecord(RecordKindSchema, KindCountsSchema),
  /** After commit: rows written (created + updated) and skipped under the "skip" policy. */
  written: z.number().optional(), skipped: z.number().optional(),
});
export type ImportCounts = z.infer<typeof ImportCountsSchema>;

export const ImportStatusSchema = z.enum(['uploaded', 'validating', 'validated', 'committing', 'committed', 'failed', 'abandoned']);
export type ImportStatus = z.infer<typeof ImportStatusSchema>;

export const SheetInfoSchema = z.object({
  kind: RecordKindSchema,
  sheet: z.string(),
  headers: z.array(z.string()),
  rows: z.number(),
  /** Automatic (or preset) mapping proposed for each header. */
  proposed: SheetMappingSchema,
});
export type SheetInfo = z.infer<typeof SheetInfoSchema>;

export const ImportViewSchema = z.object({
  id: z.uuid(),
  siteId: z.uuid(),
  siteCode: z.string(),
  fileName: z.string(),
  fileHash: z.string(),
  fileSize: z.number(),
  fileType: z.enum(['csv', 'xlsx']),
  decimal: DecimalSeparatorSchema,
  status: ImportStatusSchema,
  sheets: z.array(SheetInfoSchema),
  mapping: MappingSchema.nullable(),
  counts: ImportCountsSchema.nullable(),
  problemCount: z.number(),
  policy: ExistingPolicySchema.nullable(),
  /** An earlier committed import of the same file (same SHA-256). */
  previousImport: z.object({ id: z.uuid(), committedAt: z.string().nullable(), fileName: z.string() }).nullable(),
  dryRunJobId: z.uuid().nullable(),
  commitJobId: z.uuid().nullable(),
  error: z.string().nullable(),
  createdBy: z.string().nullable(),
  createdByEmail: z.string().nullable(),
  createdAt: z.string(),
  validatedAt: z.string().nullable(),
  committedAt: z.string().nullable(),
  fileDeleted: z.boolean(),
});
export type ImportView = z.infer<typeof ImportViewSchema>;

export const ImportListQuerySchema = z.strictObject({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});

export const ProblemsQuerySchema = z.strictObject({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(100),
  severity: z.enum(['error', 'warning']).optional(),
});

export const PresetSchema = z.object({ id: z.uuid(), siteId: z.uuid(), name: z.string(), mapping: MappingSchema, updatedAt: z.string() });
export type Preset = z.infer<typeof PresetSchema>;
export const PresetListQuerySchema = z.strictObject({ siteId: z.uuid('choose the site') });
export const PresetApplyQuerySchema = z.strictObject({ presetId: z.uuid() });
