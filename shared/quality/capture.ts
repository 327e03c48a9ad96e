/**
 * Case capture: the site's list of eligible operations (its theatre list, uploaded as CSV or
 * XLSX with one operation per row: date, procedure category, the hospital's own identifier)
 * against the registry's cases, per month. The identifier is only hashed (the registry's keyed
 * hash, HMAC of site and identifier): it is never stored, logged or echoed, not even in errors.
 *
 * Matching, in this order, one-to-one:
 * 1. by identifier: a case of the same site with the same keyed hash and surgery date;
 * 2. by date and category: a case of the same site, same surgery date and procedure category
 *    that has no keyed hash and was not matched in step 1 ("probable" match);
 * operations left over are missing from the registry and listed for abstraction.
 * Withdrawn cases do not count as captured.
 */
import { z } from 'zod';
import { ProcedureCategorySchema } from '../clinical/codes.js';
import { IsoDateSchema } from '../clinical/dates.js';
import { MonthSchema, SiteListSchema } from './common.js';

/** Accepted column headings (case and spaces ignored) for each theatre-list column. */
export const THEATRE_LIST_COLUMNS = {
  operationDate: ['operation date', 'date', 'surgery date'],
  procedureCategory: ['procedure category', 'category'],
  localIdentifier: ['local identifier', 'identifier', 'hospital identifier'],
} as const;
export type TheatreListColumn = keyof typeof THEATRE_LIST_COLUMNS;

/** One row as read from the file (before hashing). */
export const TheatreListRowSchema = z.object({
  operationDate: IsoDateSchema,
  procedureCategory: ProcedureCategorySchema,
  localIdentifier: z.string().trim().min(1, 'is empty').max(64, 'is longer than 64 characters'),
});

export const TheatreListUploadFieldsSchema = z.strictObject({ siteId: z.uuid('choose the site the list belongs to') });

export const TheatreListUploadSchema = z.object({
  id: z.uuid(),
  siteId: z.uuid(),
  siteCode: z.string(),
  rows: z.number().int(),
  fromDate: z.string().nullable(),
  toDate: z.string().nullable(),
  replaced: z.number().int(),
  createdAt: z.string(),
  createdByEmail: z.string().nullable(),
});
export type TheatreListUpload = z.infer<typeof TheatreListUploadSchema>;

export const CaptureQuerySchema = z.strictObject({ siteId: SiteListSchema, from: MonthSchema.optional(), to: MonthSchema.optional() });
export type CaptureQuery = z.infer<typeof CaptureQuerySchema>;

export const CaptureMonthSchema = z.object({
  siteId: z.uuid(),
  siteCode: z.string(),
  month: z.string(),
  listed: z.number().int(),
  matchedByIdentifier: z.number().int(),
  matchedByDate: z.number().int(),
  missing: z.number().int(),
  /** Share of listed operations with a registry case (both match kinds); null with no list. */
  capture: z.number().nullable(),
  /** Cases in the registry that month not on the list (not withdrawn). */
  notOnList: z.number().int(),
});
export const MissingOperationSchema = z.object({ entryId: z.uuid(), siteId: z.uuid(), siteCode: z.string(), operationDate: z.string(), procedureCategory: z.string(), month: z.string() });

export const CaptureReportSchema = z.object({
  months: z.array(CaptureMonthSchema),
  missing: z.array(MissingOperationSchema),
  missingTotal: z.number().int(),
  uploads: z.array(TheatreListUploadSchema),
});
export type CaptureReport = z.infer<typeof CaptureReportSchema>;
export type CaptureMonth = z.infer<typeof CaptureMonthSchema>;
