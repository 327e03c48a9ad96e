/**
 * Calendar-day arithmetic on ISO dates (`YYYY-MM-DD`), in whole days, with no time zone and no
 * clock: a date is a calendar day as the hospital recorded it.
 */
import { AnalysisInputError } from '../errors.js';

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

/**
 * Day number (days since 1970-01-01) of an ISO calendar date.
 * @throws AnalysisInputError when the value is not a real `YYYY-MM-DD` date
 */
export function dayNumber(fn: string, field: string, value: unknown): number {
  if (typeof value !== 'string') {
    throw new AnalysisInputError(fn, field, `is missing or not a date (got ${value === undefined ? 'nothing' : JSON.stringify(value)}); enter a date as YYYY-MM-DD`);
  }
  const m = ISO_DATE.exec(value);
  const ms = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : Number.NaN;
  if (!m || Number.isNaN(ms) || isoFromDayNumber(ms / MS_PER_DAY) !== value) {
    throw new AnalysisInputError(fn, field, `"${value}" is not a calendar date; enter it as YYYY-MM-DD`);
  }
  return ms / MS_PER_DAY;
}

/** ISO date of a day number. */
export function isoFromDayNumber(day: number): string {
  return new Date(day * MS_PER_DAY).toISOString().slice(0, 10);
}

/** `date` plus `days` calendar days. */
export function addDays(fn: string, field: string, date: string, days: number): string {
  return isoFromDayNumber(dayNumber(fn, field, date) + days);
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(fn: string, fromField: string, from: string, toField: string, to: string): number {
  return dayNumber(fn, toField, to) - dayNumber(fn, fromField, from);
}
