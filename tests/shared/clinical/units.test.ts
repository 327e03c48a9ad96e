/**
 * Unit conversions. Check values come from the definitions of the units, not from this code:
 * - 1 dL = 0.1 L (SI), so 1 g/dL = 10 g/L;
 * - the Celsius and Fahrenheit scales: water freezes at 0 °C = 32 °F and boils at 100 °C =
 *   212 °F; -40 °C = -40 °F; 37 °C = 98.6 °F;
 * - the standard atmosphere: 760 mmHg = 101.325 kPa (so 1 kPa = 7.50062 mmHg);
 * - 1 mm3 = 1 µL = 10^-6 L, so 1 × 10^9/L = 1,000 per mm3.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  MMHG_PER_KPA,
  UnitConversionError,
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  gPerDlToGPerL,
  gPerLToGPerDl,
  gigaPerLToPerMm3,
  kpaToMmHg,
  mmHgToKpa,
  perMm3ToGigaPerL,
  quantityMeasurementSchema,
  toStoredUnit,
  type MeasurementUnit,
} from '../../../shared/clinical/units.js';

describe('conversion factors', () => {
  it('when haemoglobin is 13.5 g/dL, then it is 135 g/L (1 dL = 0.1 L)', () => {
    expect(gPerDlToGPerL(13.5)).toBeCloseTo(135, 10);
    expect(gPerLToGPerDl(135)).toBeCloseTo(13.5, 10);
  });

  it.each([
    [0, 32],
    [100, 212],
    [-40, -40],
    [37, 98.6],
  ])('when the temperature is %s °C, then it is %s °F (definition of the scales)', (c, f) => {
    expect(celsiusToFahrenheit(c)).toBeCloseTo(f, 10);
    expect(fahrenheitToCelsius(f)).toBeCloseTo(c, 10);
  });

  it('when pressure is one standard atmosphere, then 760 mmHg is 101.325 kPa', () => {
    expect(mmHgToKpa(760)).toBeCloseTo(101.325, 3);
    expect(kpaToMmHg(101.325)).toBeCloseTo(760, 2);
    expect(MMHG_PER_KPA).toBeCloseTo(760 / 101.325, 5);
  });

  it('when the white-cell count is 12 x10^9/L, then it is 12,000 per mm3', () => {
    expect(gigaPerLToPerMm3(12)).toBe(12_000);
    expect(perMm3ToGigaPerL(4_000)).toBe(4);
  });

  it('when any temperature goes to °F and back, then it is unchanged (inverse functions)', () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 200, noNaN: true }), (c) => {
        expect(fahrenheitToCelsius(celsiusToFahrenheit(c))).toBeCloseTo(c, 9);
      }),
    );
  });

  it('when any pressure goes to kPa and back, then it is unchanged', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1000, noNaN: true }), (mmHg) => {
        expect(kpaToMmHg(mmHgToKpa(mmHg))).toBeCloseTo(mmHg, 9);
      }),
    );
  });
});

describe('toStoredUnit', () => {
  it.each([
    ['haemoglobin', 120, 'g/L', 12],
    ['haemoglobin', 12, 'g/dL', 12],
    ['temperature', 100.4, 'degF', 38],
    ['temperature', 38.2, 'degC', 38.2],
    ['pao2', 8, 'kPa', 60],
    ['pao2', 13.3, 'kPa', 99.8],
    ['pf-ratio', 40, 'kPa', 300],
    ['pf-ratio', 240, 'mmHg', 240],
    ['wbc', 12, '10^9/L', 12_000],
    ['wbc', 4_001, 'per-mm3', 4_001],
  ] as const)('when %s is %s %s, then the stored value is %s', (quantity, value, unit, stored) => {
    // Stored precision: 0.01 g/dL, 0.01 °C, 0.1 mmHg, 1 per mm3, so threshold values typed in
    // the other unit (100.4 °F for 38.0 °C; 8 kPa for 60 mmHg; 40 kPa for 300 mmHg) land exactly.
    expect(toStoredUnit(quantity, value, unit)).toBe(stored);
  });

  it('when the unit does not belong to the quantity, then it throws naming the accepted units', () => {
    expect(() => toStoredUnit('haemoglobin', 12, 'kPa')).toThrow(UnitConversionError);
    expect(() => toStoredUnit('haemoglobin', 12, 'kPa')).toThrow(/g\/dL or g\/L/);
  });

  it('when the value is not a finite number, then it throws', () => {
    expect(() => toStoredUnit('temperature', Number.NaN, 'degC')).toThrow(UnitConversionError);
    expect(() => toStoredUnit('temperature', undefined as unknown as number, 'degC')).toThrow(UnitConversionError);
  });

  it('when the unit is unknown, then it throws', () => {
    expect(() => toStoredUnit('pao2', 60, 'torr' as MeasurementUnit)).toThrow(UnitConversionError);
  });
});

describe('quantityMeasurementSchema', () => {
  const hb = quantityMeasurementSchema('haemoglobin');

  it('when haemoglobin 135 is entered in g/L, then it is accepted', () => {
    expect(hb.safeParse({ value: 135, unit: 'g/L' }).success).toBe(true);
  });

  it('when haemoglobin 135 is entered in g/dL, then it is rejected as impossible, naming the value', () => {
    const r = hb.safeParse({ value: 135, unit: 'g/dL' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['value']);
    expect(r.error?.issues[0].message).toMatch(/possible range/);
  });

  it('when the unit belongs to another quantity, then the unit is rejected', () => {
    const r = hb.safeParse({ value: 12, unit: 'degC' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['unit']);
  });
});
