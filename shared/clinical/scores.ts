/**
 * Input and result shapes of the ARISCAT pre-operative PPC risk score (Canet J et al.,
 * Anesthesiology 2010;113:1338-50). The computation is `ariscatScore` in
 * `analysis/clinical/ariscat.ts`; the case form and the server import the same function.
 */
import { z } from 'zod';
import { AriscatIncisionSchema } from './codes.js';

export const AriscatInputSchema = z.object({
  /** Age in years (fractions allowed). */
  age: z.number().finite().min(0).max(130),
  /** Pre-operative SpO2 on room air, %. */
  preopSpO2: z.number().finite().min(0).max(100),
  /** Respiratory infection in the last month (with fever and antibiotics). */
  respiratoryInfectionLastMonth: z.boolean(),
  /** Pre-operative haemoglobin in g/dL (convert g/L with `toStoredUnit`). */
  preopHemoglobin: z.number().finite().gt(0).max(25),
  incision: AriscatIncisionSchema,
  durationMinutes: z.number().finite().min(0).max(2880),
  /** From the case's urgency alone (an ASA "E" that disagrees is a validation warning). */
  emergency: z.boolean(),
});
export type AriscatInput = z.infer<typeof AriscatInputSchema>;

export const AriscatRiskClassSchema = z.enum(['low', 'intermediate', 'high']);
export type AriscatRiskClass = z.infer<typeof AriscatRiskClassSchema>;
export const ARISCAT_RISK_CLASS_LABELS: Record<AriscatRiskClass, string> = {
  low: 'Low (< 26 points)',
  intermediate: 'Intermediate (26–44 points)',
  high: 'High (≥ 45 points)',
};

export const AriscatResultSchema = z.object({
  points: z.number().int().min(0).max(123),
  riskClass: AriscatRiskClassSchema,
});
export type AriscatResult = z.infer<typeof AriscatResultSchema>;

/** Points per factor, for showing how the total was reached. */
export const AriscatBreakdownSchema = AriscatResultSchema.extend({
  components: z.object({
    age: z.number(),
    preopSpO2: z.number(),
    respiratoryInfectionLastMonth: z.number(),
    preopHemoglobin: z.number(),
    incision: z.number(),
    durationMinutes: z.number(),
    emergency: z.number(),
  }),
});
export type AriscatBreakdown = z.infer<typeof AriscatBreakdownSchema>;
