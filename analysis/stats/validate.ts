/**
 * Input checks shared by the analysis functions. Each throws an AnalysisInputError whose
 * message names the function, the argument and the fix; none of them coerces a value.
 */
import { AnalysisInputError } from '../errors.js';

function show(value: unknown): string {
  if (typeof value === 'number' || typeof value === 'boolean' || value === null || value === undefined) return String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  return typeof value;
}

/** A finite number (any sign). */
export function finiteNumber(fn: string, field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new AnalysisInputError(fn, field, `must be a finite number (got ${show(value)})`);
  }
  return value;
}

/** A count: a whole number >= 0. */
export function count(fn: string, field: string, value: unknown): number {
  const v = finiteNumber(fn, field, value);
  if (!Number.isInteger(v) || v < 0) {
    throw new AnalysisInputError(fn, field, `must be a whole number of 0 or more (got ${show(value)})`);
  }
  return v;
}

/** A denominator count: a whole number >= 1 (a total of 0 leaves the ratio undefined). */
export function positiveCount(fn: string, field: string, value: unknown): number {
  const v = count(fn, field, value);
  if (v === 0) {
    throw new AnalysisInputError(fn, field, 'must be at least 1: a total of 0 gives no proportion; leave such a group out');
  }
  return v;
}

/** A strictly positive finite amount (exposure, expected count, multiplier). */
export function positiveNumber(fn: string, field: string, value: unknown): number {
  const v = finiteNumber(fn, field, value);
  if (v <= 0) throw new AnalysisInputError(fn, field, `must be greater than 0 (got ${show(value)})`);
  return v;
}

/** A non-negative finite amount. */
export function nonNegativeNumber(fn: string, field: string, value: unknown): number {
  const v = finiteNumber(fn, field, value);
  if (v < 0) throw new AnalysisInputError(fn, field, `must be 0 or more (got ${show(value)})`);
  return v;
}

/** A confidence level strictly between 0 and 1; undefined gives the default 0.95. */
export function level(fn: string, value: unknown, field = 'level'): number {
  if (value === undefined) return 0.95;
  const v = finiteNumber(fn, field, value);
  if (v <= 0 || v >= 1) {
    throw new AnalysisInputError(fn, field, `must be strictly between 0 and 1, e.g. 0.95 (got ${show(value)})`);
  }
  return v;
}

/** An event count with its total: 0 <= events <= total, total >= 1. */
export function eventsOfTotal(fn: string, field: string, events: unknown, total: unknown): { events: number; total: number } {
  const n = positiveCount(fn, `${field}total`, total);
  const x = count(fn, `${field}events`, events);
  if (x > n) {
    throw new AnalysisInputError(fn, `${field}events`, `(${x}) must not exceed ${field}total (${n})`);
  }
  return { events: x, total: n };
}

/** A non-empty array. */
export function nonEmptyArray<T>(fn: string, field: string, value: unknown): readonly T[] {
  if (!Array.isArray(value)) throw new AnalysisInputError(fn, field, `must be an array (got ${show(value)})`);
  if (value.length === 0) throw new AnalysisInputError(fn, field, 'must not be empty: at least one value is needed');
  return value as readonly T[];
}

/** An object (for the options argument and array elements). */
export function object(fn: string, field: string, value: unknown): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new AnalysisInputError(fn, field, `must be an object (got ${show(value)})`);
  }
  return value as Record<string, unknown>;
}

/** Options: undefined becomes {}. */
export function options(fn: string, value: unknown): Record<string, unknown> {
  return value === undefined ? {} : object(fn, 'options', value);
}

/**
 * The baseline length of a chart: how many leading points set the centre line.
 * undefined means all `available` points.
 */
export function baseline(fn: string, value: unknown, available: number, what = 'points'): number {
  if (value === undefined) return available;
  const v = finiteNumber(fn, 'options.baseline', value);
  if (!Number.isInteger(v) || v < 1) {
    throw new AnalysisInputError(fn, 'options.baseline', `must be a whole number of 1 or more (got ${show(value)})`);
  }
  if (v > available) {
    throw new AnalysisInputError(
      fn,
      'options.baseline',
      `(${v}) is more than the ${available} ${what} available: pass at most ${available}, or leave it out to use all`,
    );
  }
  return v;
}
