import { z } from 'zod';

/** The quasi-identifiers the check groups by (issue 8; Sweeney 2002). */
export const QUASI_IDENTIFIERS = ['ageBand', 'sex', 'siteCode', 'surgeryYear', 'procedureCategory'] as const;
export type QuasiIdentifier = (typeof QUASI_IDENTIFIERS)[number];
export const QUASI_IDENTIFIER_LABELS: Record<QuasiIdentifier, string> = {
  ageBand: 'age band', sex: 'sex', siteCode: 'site code', surgeryYear: 'surgery year', procedureCategory: 'procedure category',
};

/** Smallest class size accepted without a warning. */
export const K_THRESHOLD = 5;

export const KAnonymitySummarySchema = z.object({
  records: z.number().int(),
  classes: z.number().int(),
  /** Size of the smallest equivalence class (0 when there are no records). */
  k: z.number().int(),
  classesBelow: z.number().int(),
  recordsBelow: z.number().int(),
  threshold: z.number().int(),
});
export type KAnonymitySummary = z.infer<typeof KAnonymitySummarySchema>;

/**
 * k-anonymity of a release: each record is indistinguishable from at least k - 1 others on the
 * quasi-identifiers; k is the size of the smallest equivalence class (records sharing every
 * quasi-identifier value). Source: Sweeney L, "k-anonymity: a model for protecting privacy",
 * Int J Uncertainty Fuzziness Knowledge-Based Systems 2002;10(5):557-70.
 * @param classSizes the size of every equivalence class (each > 0), e.g. from SQL GROUP BY
 * @param threshold the k wanted (default 5)
 * @throws Error for a size that is not a whole number above 0
 * @example kAnonymity([7, 3, 12]) // { records: 22, classes: 3, k: 3, classesBelow: 1, recordsBelow: 3, threshold: 5 }
 */
export function kAnonymity(classSizes: readonly number[], threshold = K_THRESHOLD): KAnonymitySummary {
  let k = Infinity;
  let records = 0;
  let classesBelow = 0;
  let recordsBelow = 0;
  classSizes.forEach((n, i) => {
    if (!Number.isInteger(n) || n < 1) throw new Error(`kAnonymity: classSizes[${i}] is ${n}; every equivalence class holds a whole number of records above 0`);
    records += n;
    if (n < k) k = n;
    if (n < threshold) {
      classesBelow += 1;
      recordsBelow += n;
    }
  });
  return { records, classes: classSizes.length, k: classSizes.length ? k : 0, classesBelow, recordsBelow, threshold };
}
