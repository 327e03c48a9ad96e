/** Reading cells: Excel date serials, decimal separators, yes/no, codes, formula neutralisation, column letters. */
import { describe, expect, it } from 'vitest';
import { columnLetter, excelSerialToIso, neutraliseText, readCell } from '../../../server/imports/cells.js';
import { autoMapHeader, columnOf, cellKindOf } from '../../../shared/imports/fields.js';
import { CASE_FIELDS } from '../../../shared/registry/case.js';

const opts = { decimal: 'point' as const, today: '2026-12-01' };
const col = (key: string) => columnOf('cases', key)!;

describe('Excel date serials (1900 date system)', () => {
  it('when a serial is given, then it maps to the calendar day Microsoft documents', () => {
    // Microsoft, DATE function: "January 1, 2008 is serial number 39448".
    expect(excelSerialToIso(39448)).toBe('2008-01-01');
    // Microsoft, "Date systems in Excel": serial 1 is January 1, 1900.
    expect(excelSerialToIso(1)).toBe('1900-01-01');
    // Serial 60 is the fictitious 1900-02-29 kept for Lotus 1-2-3 compatibility (Microsoft KB 214326): refused.
    expect(excelSerialToIso(60)).toBeNull();
    expect(excelSerialToIso(61)).toBe('1900-03-01');
    expect(excelSerialToIso(59)).toBe('1900-02-28');
    // A time of day (fraction) belongs to the same calendar day.
    expect(excelSerialToIso(39448.75)).toBe('2008-01-01');
  });
});

describe('readCell', () => {
  it('when the decimal separator is declared, then "71,5" reads under comma and "71.5" under point; the other is a problem with the fix', () => {
    expect(readCell('71,5', col('weightKg'), { ...opts, decimal: 'comma' })).toEqual({ ok: true, value: 71.5 });
    expect(readCell('71.5', col('weightKg'), opts)).toEqual({ ok: true, value: 71.5 });
    const r = readCell('71.5', col('weightKg'), { ...opts, decimal: 'comma' });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.hint).toContain('71,5');
  });

  it('when a number cell holds -2, then it stays the number -2 (never neutralised)', () => {
    expect(readCell(-2, col('age'), opts)).toEqual({ ok: true, value: -2 });
    expect(readCell('-2', col('age'), opts)).toEqual({ ok: true, value: -2 });
  });

  it('when text begins with = + - @, then it gets a leading apostrophe (OWASP CSV injection guidance)', () => {
    for (const s of ['=1+1', '+SUM(A1)', '-2+3', '@cmd']) expect(neutraliseText(s)).toBe(`'${s}`);
    expect(neutraliseText('plain')).toBe('plain');
    expect(readCell('=HYPERLINK("x")', col('notes'), opts)).toEqual({ ok: true, value: `'=HYPERLINK("x")` });
    expect(readCell({ formula: 'A1*2', result: 4 }, col('age'), opts).ok).toBe(false);
  });

  it('when yes/no, codes and labels are given, then they read case-insensitively; a future date is refused', () => {
    expect(readCell('Yes', col('copd'), opts)).toEqual({ ok: true, value: true });
    expect(readCell('0', col('copd'), opts)).toEqual({ ok: true, value: false });
    expect(readCell('FEMALE', col('sex'), opts)).toEqual({ ok: true, value: 'female' });
    expect(readCell('Elective', col('urgency'), opts)).toEqual({ ok: true, value: 'elective' });
    expect(readCell('2026-12-02', col('surgeryDate'), opts).ok).toBe(false);
    expect(readCell('2026-02-30', col('surgeryDate'), opts).ok).toBe(false);
    expect(readCell('2026-12-01', col('surgeryDate'), opts)).toEqual({ ok: true, value: '2026-12-01' });
  });

  it('when a text is longer than its field allows, then it is a problem naming the limit', () => {
    const r = readCell('x'.repeat(501), col('notes'), opts);
    expect(!r.ok && r.message).toContain('limit of 500');
  });
});

describe('automatic mapping and cell kinds', () => {
  it('when headers match a field name or label in any case and spacing, then they map; others do not', () => {
    expect(autoMapHeader('cases', 'surgeryDate')).toBe('surgeryDate');
    expect(autoMapHeader('cases', 'SURGERY DATE')).toBe('surgeryDate');
    expect(autoMapHeader('cases', 'surgery_date')).toBe('surgeryDate');
    expect(autoMapHeader('cases', 'Pre-operative SpO2 on room air')).toBe('preopSpO2');
    expect(autoMapHeader('cases', 'Patient name')).toBeNull();
    expect(autoMapHeader('therapy', 'Case key (this file only)')).toBe('caseKey');
  });
  it('when a field schema is an integer, then its cell kind says so', () => {
    expect(cellKindOf(CASE_FIELDS.age)).toEqual({ type: 'number', integer: true });
    expect(cellKindOf(CASE_FIELDS.weightKg)).toEqual({ type: 'number', integer: false });
  });
  it('column letters follow the spreadsheet convention (A..Z, AA..)', () => {
    expect([1, 26, 27, 52, 703].map(columnLetter)).toEqual(['A', 'Z', 'AA', 'AZ', 'AAA']);
  });
});
