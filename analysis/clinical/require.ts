/** Input guards for the clinical functions: a missing or impossible input throws, never scores zero. */
import { AnalysisInputError } from '../errors.js';

function show(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'number') return String(value);
  return JSON.stringify(value) ?? String(value);
}

/** The argument object itself. */
export function requireObject(fn: string, field: string, value: unknown): asserts value is Record<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new AnalysisInputError(fn, field, `must be an object (got ${show(value)})`);
  }
}

/**
 * A finite number within [min, max].
 * @param unitHint printed after the limits, e.g. "g/dL"
 * @param fix extra advice when out of range (e.g. "a value above 25 is probably in g/L")
 */
export function requireNumber(
  fn: string,
  field: string,
  value: unknown,
  limits: { min?: number; max?: number; integer?: boolean; unit?: string; fix?: string } = {},
): number {
  const unit = limits.unit ? ` ${limits.unit}` : '';
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new AnalysisInputError(fn, field, `is missing or not a finite number (got ${show(value)}); enter it${unit ? ` in${unit}` : ''}`);
  }
  if (limits.integer && !Number.isInteger(value)) {
    throw new AnalysisInputError(fn, field, `must be a whole number (got ${value})`);
  }
  const below = limits.min !== undefined && value < limits.min;
  const above = limits.max !== undefined && value > limits.max;
  if (below || above) {
    const range =
      limits.min !== undefined && limits.max !== undefined
        ? `between ${limits.min} and ${limits.max}${unit}`
        : limits.min !== undefined
          ? `at least ${limits.min}${unit}`
          : `at most ${limits.max}${unit}`;
    throw new AnalysisInputError(fn, field, `must be ${range} (got ${value})${limits.fix ? `; ${limits.fix}` : ''}`);
  }
  return value;
}

export function requireBoolean(fn: string, field: string, value: unknown): boolean {
  if (typeof value !== 'boolean') {
    throw new AnalysisInputError(fn, field, `is missing or not true/false (got ${show(value)}); answer yes or no`);
  }
  return value;
}

export function requireOneOf<T extends string>(fn: string, field: string, value: unknown, allowed: readonly T[]): T {
  if (typeof value !== 'string' || !(allowed as readonly string[]).includes(value)) {
    throw new AnalysisInputError(fn, field, `must be one of ${allowed.join(', ')} (got ${show(value)})`);
  }
  return value as T;
}

export function requireArray(fn: string, field: string, value: unknown): readonly unknown[] {
  if (!Array.isArray(value)) throw new AnalysisInputError(fn, field, `must be a list (got ${show(value)})`);
  return value;
}
