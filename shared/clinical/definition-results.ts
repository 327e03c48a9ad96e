/**
 * Results of evaluating a published PPC definition over an event's observations: per
 * criterion, whether it is met, missing (no evidence recorded) or not met, why, and which
 * observations were used. Stored with the event together with the definition and version.
 */
import { z } from 'zod';
import { IsoDateSchema } from './dates.js';

/** met: evidence meets it; not-met: evidence recorded but does not meet it; missing: no evidence. */
export const CriterionStatusSchema = z.enum(['met', 'not-met', 'missing']);
export type CriterionStatus = z.infer<typeof CriterionStatusSchema>;

export const CriterionResultSchema = z.object({
  id: z.string(),
  label: z.string(),
  met: z.boolean(),
  status: CriterionStatusSchema,
  reason: z.string(),
  observationIds: z.array(z.string()),
});
export type CriterionResult = z.infer<typeof CriterionResultSchema>;

export const Pnu1ResultSchema = z.object({
  definition: z.literal('CDC/NHSN PNU1'),
  version: z.literal('2022'),
  source: z.string(),
  met: z.boolean(),
  criteria: z.array(CriterionResultSchema),
  /** The first positive chest image that set the infection window. */
  anchorObservationId: z.string().nullable(),
  windowStart: IsoDateSchema.nullable(),
  windowEnd: IsoDateSchema.nullable(),
  dateOfEvent: IsoDateSchema.nullable(),
  /** Day 1 = the day of admission. */
  hospitalDayOfEvent: z.number().int().nullable(),
  presentOnAdmission: z.boolean().nullable(),
  healthcareAssociated: z.boolean().nullable(),
  /** True when the date of event falls within 14 days of an earlier pneumonia's: not a new event. */
  withinRepeatInfectionTimeframe: z.boolean().nullable(),
});
export type Pnu1Result = z.infer<typeof Pnu1ResultSchema>;

export const EpcoComponentSchema = z.enum([
  'respiratory-infection',
  'respiratory-failure',
  'pleural-effusion',
  'atelectasis',
  'pneumothorax',
  'bronchospasm',
  'aspiration-pneumonitis',
]);
export type EpcoComponent = z.infer<typeof EpcoComponentSchema>;

export const EpcoComponentResultSchema = z.object({
  component: EpcoComponentSchema,
  label: z.string(),
  met: z.boolean(),
  /** Earliest post-operative day on which the component's evidence was complete. */
  onsetPostoperativeDay: z.number().int().nullable(),
  criteria: z.array(CriterionResultSchema),
});
export type EpcoComponentResult = z.infer<typeof EpcoComponentResultSchema>;

export const EpcoResultSchema = z.object({
  definition: z.literal('EPCO'),
  version: z.literal('2015'),
  source: z.string(),
  /** Any component met. */
  met: z.boolean(),
  components: z.array(EpcoComponentResultSchema),
});
export type EpcoResult = z.infer<typeof EpcoResultSchema>;

export const MgsDayResultSchema = z.object({
  postoperativeDay: z.number().int(),
  date: IsoDateSchema,
  criteriaMet: z.number().int(),
  met: z.boolean(),
  criteria: z.array(CriterionResultSchema),
});
export type MgsDayResult = z.infer<typeof MgsDayResultSchema>;

export const MgsResultSchema = z.object({
  definition: z.literal('Melbourne Group Scale'),
  version: z.literal('3'),
  source: z.string(),
  met: z.boolean(),
  /** First post-operative day with 4 or more criteria, or null. */
  firstPostoperativeDayMet: z.number().int().nullable(),
  /** The most criteria met on any one day. */
  maxCriteriaMet: z.number().int(),
  days: z.array(MgsDayResultSchema),
});
export type MgsResult = z.infer<typeof MgsResultSchema>;
