/**
 * The shapes that analysis/ takes and returns, as zod schemas so the server and the client
 * can validate and reuse them; the TypeScript types are inferred from the schemas.
 */
import { z } from 'zod';

/** A point estimate with the lower and upper limits of its interval. */
export const intervalSchema = z.object({ estimate: z.number(), lower: z.number(), upper: z.number() });
export type Interval = z.infer<typeof intervalSchema>;

/** An interval whose parts may be undefined (null), e.g. a ratio with no events in either group. */
export const nullableIntervalSchema = z.object({
  estimate: z.number().nullable(),
  lower: z.number().nullable(),
  upper: z.number().nullable(),
});
export type NullableInterval = z.infer<typeof nullableIntervalSchema>;

/** Events out of a total of cases: 0 <= events <= total, total >= 1. */
export const countSchema = z.object({ events: z.number().int().nonnegative(), total: z.number().int().positive() });
export type Count = z.infer<typeof countSchema>;

/** Events over an exposure (e.g. patient-days or ventilator-days). */
export const exposureCountSchema = z.object({ events: z.number().int().nonnegative(), exposure: z.number().positive() });
export type ExposureCount = z.infer<typeof exposureCountSchema>;

/** One row of a frequency table: how many cases had this value (e.g. a length of stay in days). */
export const frequencySchema = z.object({ value: z.number(), count: z.number().int().nonnegative() });
export type Frequency = z.infer<typeof frequencySchema>;

/** A stretch of points, as indices (inclusive) into the series given. */
export const spanSchema = z.object({ start: z.number().int(), end: z.number().int() });
export type Span = z.infer<typeof spanSchema>;
