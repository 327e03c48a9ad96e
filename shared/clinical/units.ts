/**
 * The one unit-conversion module. Hospitals report values in their own units; Alveolog stores
 * one unit per quantity (haemoglobin g/dL, temperature °C, PaO2 and PaO2/FiO2 mmHg, white-cell
 * count per mm3) and converts here, nowhere else.
 *
 * Factors:
 * - haemoglobin: 1 g/dL = 10 g/L (SI prefixes: 1 dL = 0.1 L).
 * - temperature: °F = °C × 9/5 + 32 (definition of the Fahrenheit scale).
 * - pressure: 1 kPa = 7.50062 mmHg (760 mmHg = 101.325 kPa; 760 / 101.325 = 7.500617…).
 * - white cells: 1 × 10^9/L = 1,000 per mm3 (1 mm3 = 1 µL = 10^-6 L).
 */
import { z } from 'zod';

/** Unit codes as stored in JSON; `UNIT_LABELS` gives the printed form. */
export const MeasurementUnitSchema = z.enum(['g/dL', 'g/L', 'degC', 'degF', 'mmHg', 'kPa', 'per-mm3', '10^9/L']);
export type MeasurementUnit = z.infer<typeof MeasurementUnitSchema>;
export const UNIT_LABELS: Record<MeasurementUnit, string> = {
  'g/dL': 'g/dL',
  'g/L': 'g/L',
  degC: '°C',
  degF: '°F',
  mmHg: 'mmHg',
  kPa: 'kPa',
  'per-mm3': '/mm³',
  '10^9/L': '×10⁹/L',
};

/** Quantities that arrive in more than one unit. */
export const MeasuredQuantitySchema = z.enum(['haemoglobin', 'temperature', 'pao2', 'pf-ratio', 'wbc']);
export type MeasuredQuantity = z.infer<typeof MeasuredQuantitySchema>;

/** mmHg per kPa (760 mmHg = 101.325 kPa). */
export const MMHG_PER_KPA = 7.50062;

interface QuantitySpec {
  readonly label: string;
  readonly stored: MeasurementUnit;
  readonly accepted: readonly MeasurementUnit[];
  /** Decimal places kept in the stored unit: finer than any report, coarse enough that a
   *  threshold entered in the other unit (100.4 °F, 8 kPa) lands exactly on its stored value. */
  readonly storedDecimals: number;
  /** Values outside this range (stored unit) cannot be real measurements: rejected. */
  readonly possible: { readonly min: number; readonly max: number };
}

/** Per quantity: stored unit, accepted units, storage precision, possible range (common practice, no source). */
export const QUANTITIES: Readonly<Record<MeasuredQuantity, QuantitySpec>> = {
  haemoglobin: { label: 'Haemoglobin', stored: 'g/dL', accepted: ['g/dL', 'g/L'], storedDecimals: 2, possible: { min: 1, max: 25 } },
  temperature: { label: 'Temperature', stored: 'degC', accepted: ['degC', 'degF'], storedDecimals: 2, possible: { min: 25, max: 45 } },
  pao2: { label: 'PaO2', stored: 'mmHg', accepted: ['mmHg', 'kPa'], storedDecimals: 1, possible: { min: 10, max: 760 } },
  'pf-ratio': { label: 'PaO2/FiO2', stored: 'mmHg', accepted: ['mmHg', 'kPa'], storedDecimals: 1, possible: { min: 10, max: 760 } },
  wbc: { label: 'White-cell count', stored: 'per-mm3', accepted: ['per-mm3', '10^9/L'], storedDecimals: 0, possible: { min: 0, max: 500_000 } },
};

/** A value with the unit it was reported in. */
export const MeasurementSchema = z.object({
  value: z.number({ error: 'enter a number' }).finite('enter a finite number'),
  unit: MeasurementUnitSchema,
});
export type Measurement = z.infer<typeof MeasurementSchema>;

/** Thrown when a value and unit cannot be converted (unknown unit, wrong quantity, not a number). */
export class UnitConversionError extends Error {
  override name = 'UnitConversionError';
}

export const gPerDlToGPerL = (gPerDl: number): number => gPerDl * 10;
export const gPerLToGPerDl = (gPerL: number): number => gPerL / 10;
export const celsiusToFahrenheit = (c: number): number => (c * 9) / 5 + 32;
export const fahrenheitToCelsius = (f: number): number => ((f - 32) * 5) / 9;
export const kpaToMmHg = (kpa: number): number => kpa * MMHG_PER_KPA;
export const mmHgToKpa = (mmHg: number): number => mmHg / MMHG_PER_KPA;
export const perMm3ToGigaPerL = (perMm3: number): number => perMm3 / 1000;
export const gigaPerLToPerMm3 = (gigaPerL: number): number => gigaPerL * 1000;

function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  // Number.EPSILON nudges halves such as 1.005 the way people round them.
  return Math.round((value + Math.sign(value) * Number.EPSILON * Math.abs(value)) * f) / f;
}

function exactToStored(quantity: MeasuredQuantity, value: number, unit: MeasurementUnit): number {
  const spec = QUANTITIES[quantity];
  if (unit === spec.stored) return value;
  switch (unit) {
    case 'g/L':
      return gPerLToGPerDl(value);
    case 'degF':
      return fahrenheitToCelsius(value);
    case 'kPa':
      return kpaToMmHg(value);
    case '10^9/L':
      return gigaPerLToPerMm3(value);
    default:
      throw new UnitConversionError(`no conversion from ${unit} to ${spec.stored}`);
  }
}

/**
 * Converts a reported value to the stored unit of its quantity, rounded to the storage
 * precision in `QUANTITIES` (e.g. 100.4 °F -> 38 °C, 8 kPa -> 60 mmHg, 12 g/L -> 1.2 g/dL).
 *
 * @param quantity which quantity the value measures
 * @param value the number as reported
 * @param unit the unit it was reported in; must be one the quantity accepts
 * @throws UnitConversionError for a non-finite value or a unit the quantity does not accept
 */
export function toStoredUnit(quantity: MeasuredQuantity, value: number, unit: MeasurementUnit): number {
  const spec = QUANTITIES[quantity];
  if (!spec) throw new UnitConversionError(`unknown quantity "${String(quantity)}"; use one of ${Object.keys(QUANTITIES).join(', ')}`);
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new UnitConversionError(`${spec.label}: the value must be a finite number (got ${String(value)})`);
  }
  if (!spec.accepted.includes(unit)) {
    throw new UnitConversionError(
      `${spec.label}: unit "${String(unit)}" is not accepted; use ${spec.accepted.map((u) => UNIT_LABELS[u]).join(' or ')}`,
    );
  }
  return roundTo(exactToStored(quantity, value, unit), spec.storedDecimals);
}

/** Same as `toStoredUnit` for a `{ value, unit }` measurement. */
export function measurementToStored(quantity: MeasuredQuantity, m: Measurement): number {
  return toStoredUnit(quantity, m.value, m.unit);
}

/**
 * A zod schema for one quantity's measurement: the unit must be one it accepts and the value,
 * once converted, must lie in its possible range. The message names the range in the unit typed.
 */
export function quantityMeasurementSchema(quantity: MeasuredQuantity) {
  const spec = QUANTITIES[quantity];
  return MeasurementSchema.superRefine((m, ctx) => {
    if (!spec.accepted.includes(m.unit)) {
      ctx.addIssue({
        code: 'custom',
        path: ['unit'],
        message: `${spec.label} is entered in ${spec.accepted.map((u) => UNIT_LABELS[u]).join(' or ')}`,
      });
      return;
    }
    const stored = toStoredUnit(quantity, m.value, m.unit);
    if (stored < spec.possible.min || stored > spec.possible.max) {
      ctx.addIssue({
        code: 'custom',
        path: ['value'],
        message: `${spec.label} ${m.value} ${UNIT_LABELS[m.unit]} is outside the possible range ${spec.possible.min}–${spec.possible.max} ${UNIT_LABELS[spec.stored]}; check the number and its unit`,
      });
    }
  });
}
