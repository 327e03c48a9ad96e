/**
 * Per-field agreement between the first abstraction (values when the sample was drawn) and the
 * blind re-abstraction, using analysis/: cohenKappa + landisKochBand for coded fields,
 * blandAltman for numbers and dates (dates as day numbers, so the difference is in days).
 * Pure: values in, figures out.
 */
import { blandAltman, cohenKappa, landisKochBand } from '../../analysis/index.js';
import {
  NOT_DOCUMENTED,
  REABSTRACTION_FIELDS,
  fieldLabel,
  fieldUnit,
  type FieldAgreement,
  type ReabstractionField,
} from '../../shared/quality/reabstraction.js';

export interface ValuePair { original: unknown; reabstracted: unknown }

const isMissing = (v: unknown) => v === null || v === undefined || v === '';

/** The category label of a coded value ("not documented" for an empty one). */
export function codedLabel(v: unknown): string {
  return isMissing(v) ? NOT_DOCUMENTED : String(v);
}

/** A number or a date as a number (dates: days since 1970-01-01). */
export function numericValue(field: ReabstractionField, v: unknown): number | null {
  if (isMissing(v)) return null;
  if (REABSTRACTION_FIELDS[field] === 'date') return Math.round(Date.parse(`${String(v)}T00:00:00Z`) / 86_400_000);
  const n = Number(v);
  return Number.isFinite(n) ? n : null;
}

/** Whether the two abstractions agree on a value (exactly; both empty counts as agreement). */
export function sameValue(field: ReabstractionField, a: unknown, b: unknown): boolean {
  if (REABSTRACTION_FIELDS[field] === 'coded') return codedLabel(a) === codedLabel(b);
  const x = numericValue(field, a);
  const y = numericValue(field, b);
  return x === y;
}

export function fieldAgreement(field: ReabstractionField, pairs: readonly ValuePair[]): FieldAgreement {
  const kind = REABSTRACTION_FIELDS[field];
  const base = { field, label: fieldLabel(field), kind, unit: fieldUnit(field) ?? null, pairs: pairs.length };
  const agree = pairs.filter((p) => sameValue(field, p.original, p.reabstracted)).length;
  const out: FieldAgreement = {
    ...base, agree, percentAgreement: pairs.length ? agree / pairs.length : null,
    kappa: null, observedAgreement: null, expectedAgreement: null, band: null, limits: null, pairsWithMissing: 0, note: null,
  };
  if (!pairs.length) return { ...out, note: 'no re-abstracted cases yet' };
  if (kind === 'coded') {
    const k = cohenKappa(pairs.map((p) => [codedLabel(p.original), codedLabel(p.reabstracted)] as const));
    out.kappa = k.kappa;
    out.observedAgreement = k.observedAgreement;
    out.expectedAgreement = k.expectedAgreement;
    out.band = k.kappa === null ? null : landisKochBand(k.kappa);
    if (k.kappa === null) out.note = 'kappa is undefined: both abstractions used one and the same value for every case';
    out.pairsWithMissing = pairs.filter((p) => isMissing(p.original) || isMissing(p.reabstracted)).length;
  } else {
    const both = pairs
      .map((p) => [numericValue(field, p.original), numericValue(field, p.reabstracted)] as const)
      .filter((x): x is readonly [number, number] => x[0] !== null && x[1] !== null);
    out.pairsWithMissing = pairs.length - both.length;
    if (both.length) {
      const ba = blandAltman(both.map((x) => x[0]), both.map((x) => x[1]));
      out.limits = { n: ba.n, meanDifference: ba.meanDifference, sdDifference: ba.sdDifference, lower: ba.lower, upper: ba.upper };
      if (ba.n < 2) out.note = 'limits of agreement need at least two pairs with both values';
    } else out.note = 'no pair has both values';
  }
  return out;
}

/** Text of a value for the disagreement list and the export. */
export function valueText(field: ReabstractionField, v: unknown): string {
  if (isMissing(v)) return NOT_DOCUMENTED;
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  const unit = REABSTRACTION_FIELDS[field] === 'number' ? fieldUnit(field) : undefined;
  return unit ? `${String(v)} ${unit}` : String(v);
}
