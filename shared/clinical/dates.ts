import { z } from 'zod';

/** A calendar date `YYYY-MM-DD` (no time, no zone): clinical dates are local calendar days. */
export const IsoDateSchema = z.iso.date({ error: 'enter a date as YYYY-MM-DD' });
export type IsoDate = z.infer<typeof IsoDateSchema>;

/** Post-operative day: 0 is the day of surgery, negative days are before it. */
export const PostoperativeDaySchema = z
  .number({ error: 'enter the post-operative day as a whole number' })
  .int('enter the post-operative day as a whole number')
  .min(-30, 'the post-operative day cannot be more than 30 days before surgery')
  .max(365, 'the post-operative day cannot be more than 365 days after surgery');
