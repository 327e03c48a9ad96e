/**
 * Stay, follow-up and therapy-delivery measures from calendar dates. Pure: "today" is always
 * passed in, the clock is never read.
 *
 * Conventions (Alveolog's, stated in issue 3): post-operative day 0 is the day of surgery; days
 * are whole calendar days between dates (a same-day discharge is a stay of 0 days, i.e. the
 * number of midnights spent); the 30-day follow-up window runs from day 0 to day 30 inclusive.
 */
import { AnalysisInputError } from '../errors.js';
import { addDays, dayNumber } from './dates.js';
import { requireArray, requireNumber, requireObject } from './require.js';

function stay(fn: string, fromField: string, from: string, toField: string, to: string): number {
  const a = dayNumber(fn, fromField, from);
  const b = dayNumber(fn, toField, to);
  if (b < a) throw new AnalysisInputError(fn, toField, `(${to}) is before ${fromField} (${from}); check both dates`);
  return b - a;
}

/**
 * Length of stay in days, admission to discharge (calendar days; same day = 0).
 * @throws AnalysisInputError for a missing or invalid date, or discharge before admission
 * @example lengthOfStay('2024-03-01', '2024-03-08') // 7
 */
export function lengthOfStay(admissionDate: string, dischargeDate: string): number {
  return stay('lengthOfStay', 'admissionDate', admissionDate, 'dischargeDate', dischargeDate);
}

/**
 * Post-operative stay in days, surgery to discharge (calendar days; same day = 0).
 * @throws AnalysisInputError for a missing or invalid date, or discharge before surgery
 * @example postoperativeStay('2024-03-02', '2024-03-08') // 6
 */
export function postoperativeStay(surgeryDate: string, dischargeDate: string): number {
  return stay('postoperativeStay', 'surgeryDate', surgeryDate, 'dischargeDate', dischargeDate);
}

/**
 * Days from surgery to the first lung-expansion therapy: the earliest post-operative day an
 * episode started (0 = the day of surgery; negative when started before surgery).
 * @param episodes each with `startPostoperativeDay` (whole number, −30 to 365)
 * @returns null when there is no episode
 * @throws AnalysisInputError when a start day is missing or not a whole number
 * @example daysToFirstTherapy([{ startPostoperativeDay: 2 }, { startPostoperativeDay: 1 }]) // 1
 */
export function daysToFirstTherapy(episodes: readonly { readonly startPostoperativeDay: number }[]): number | null {
  const fn = 'daysToFirstTherapy';
  const list = requireArray(fn, 'episodes', episodes);
  let first: number | null = null;
  list.forEach((e, i) => {
    requireObject(fn, `episodes[${i}]`, e);
    const d = requireNumber(fn, `episodes[${i}].startPostoperativeDay`, e.startPostoperativeDay, { min: -30, max: 365, integer: true });
    if (first === null || d < first) first = d;
  });
  return first;
}

/**
 * Therapy adherence: sessions delivered / sessions prescribed, capped at 1 (more sessions
 * than prescribed is full adherence, not more than full).
 * @returns null when nothing was prescribed (adherence is undefined, not 0 or 1)
 * @throws AnalysisInputError for a negative, non-finite or non-whole count
 * @example adherence(9, 12) // 0.75
 */
export function adherence(delivered: number, prescribed: number): number | null {
  const fn = 'adherence';
  const d = requireNumber(fn, 'delivered', delivered, { min: 0, integer: true, unit: 'sessions' });
  const p = requireNumber(fn, 'prescribed', prescribed, { min: 0, integer: true, unit: 'sessions' });
  if (p === 0) return null;
  return Math.min(1, d / p);
}

/** Last post-operative day of the follow-up window. */
export const FOLLOW_UP_DAYS = 30;

/**
 * The 30-day follow-up window: from the day of surgery (day 0) to day 30, inclusive.
 * @throws AnalysisInputError for a missing or invalid date
 * @example followUpWindow('2024-01-15') // { start: '2024-01-15', end: '2024-02-14' }
 */
export function followUpWindow(surgeryDate: string): { start: string; end: string } {
  const fn = 'followUpWindow';
  dayNumber(fn, 'surgeryDate', surgeryDate);
  return { start: surgeryDate, end: addDays(fn, 'surgeryDate', surgeryDate, FOLLOW_UP_DAYS) };
}

/**
 * Whether the follow-up window has closed on `today`: true from day 31 on (day 30 is still open).
 * @param today the current calendar date, passed in by the caller
 * @throws AnalysisInputError for a missing or invalid date
 * @example followUpClosed('2024-01-15', '2024-02-14') // false; '2024-02-15' -> true
 */
export function followUpClosed(surgeryDate: string, today: string): boolean {
  const fn = 'followUpClosed';
  const end = dayNumber(fn, 'surgeryDate', surgeryDate) + FOLLOW_UP_DAYS;
  return dayNumber(fn, 'today', today) > end;
}

const INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

/**
 * The surveillance month of a case: the month of its surgery, 'YYYY-MM'.
 *
 * A calendar date (`YYYY-MM-DD`) is already local and gives its own month. An instant with an
 * offset (`2024-01-31T23:30:00Z`) is read in the network's time zone, which must then be given.
 *
 * @param surgery ISO calendar date, or ISO instant with `Z` or an offset
 * @param timeZone IANA zone (e.g. 'Europe/Madrid'); required for an instant
 * @throws AnalysisInputError for an invalid date or zone, or an instant without a zone
 * @example surveillanceMonth('2024-03-31') // '2024-03'
 * @example surveillanceMonth('2024-03-31T23:30:00Z', 'Europe/Madrid') // '2024-04'
 */
export function surveillanceMonth(surgery: string, timeZone?: string): string {
  const fn = 'surveillanceMonth';
  if (typeof surgery === 'string' && INSTANT.test(surgery)) {
    const ms = Date.parse(surgery);
    if (Number.isNaN(ms)) throw new AnalysisInputError(fn, 'surgery', `"${surgery}" is not a valid date and time`);
    if (!timeZone) throw new AnalysisInputError(fn, 'timeZone', 'is missing; a date with a time needs the network time zone (e.g. Europe/Madrid)');
    let parts: Intl.DateTimeFormatPart[];
    try {
      parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit' }).formatToParts(ms);
    } catch {
      throw new AnalysisInputError(fn, 'timeZone', `"${timeZone}" is not a known time zone; use an IANA name such as Europe/Madrid`);
    }
    const year = parts.find((p) => p.type === 'year')?.value;
    const month = parts.find((p) => p.type === 'month')?.value;
    return `${year}-${month}`;
  }
  dayNumber(fn, 'surgery', surgery);
  return surgery.slice(0, 7);
}
