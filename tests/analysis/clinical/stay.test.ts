/**
 * Stay and follow-up measures. Check values are calendar facts (the Gregorian calendar: January
 * has 31 days, February 2024 has 29, 2023 has 28) and the conventions of issue 3 (day 0 = day of
 * surgery; 30-day window from day 0 to day 30; adherence capped at 1). Time-zone cases use the
 * published EU summer-time rule (clocks change at 01:00 UTC on the last Sunday of March:
 * 31 March 2024), common practice (no source) otherwise.
 */
import { describe, expect, it } from 'vitest';
import { AnalysisInputError } from '../../../analysis/errors.js';
import {
  adherence,
  daysToFirstTherapy,
  followUpClosed,
  followUpWindow,
  lengthOfStay,
  postoperativeStay,
  surveillanceMonth,
} from '../../../analysis/clinical/stay.js';

describe('lengthOfStay and postoperativeStay', () => {
  it('when admitted 1 March and discharged 8 March, then 7 days', () => {
    expect(lengthOfStay('2024-03-01', '2024-03-08')).toBe(7);
  });

  it('when discharged the same day, then 0 days (midnights spent)', () => {
    expect(lengthOfStay('2024-03-01', '2024-03-01')).toBe(0);
    expect(postoperativeStay('2024-03-01', '2024-03-01')).toBe(0);
  });

  it('when the stay crosses 29 February 2024, then the leap day counts', () => {
    expect(lengthOfStay('2024-02-28', '2024-03-01')).toBe(2);
    expect(lengthOfStay('2023-02-28', '2023-03-01')).toBe(1);
  });

  it('when the stay crosses a year end, then days continue', () => {
    expect(postoperativeStay('2023-12-30', '2024-01-02')).toBe(3);
  });

  it('when discharge is before surgery, then it throws naming the field', () => {
    expect(() => postoperativeStay('2024-03-05', '2024-03-04')).toThrow(AnalysisInputError);
    expect(() => postoperativeStay('2024-03-05', '2024-03-04')).toThrow(/dischargeDate/);
  });

  it('when a date is missing or not a calendar date, then it throws', () => {
    expect(() => lengthOfStay(undefined as unknown as string, '2024-03-04')).toThrow(/admissionDate/);
    expect(() => lengthOfStay('2024-02-30', '2024-03-04')).toThrow(/not a calendar date/);
    expect(() => lengthOfStay('04/03/2024', '2024-03-04')).toThrow(AnalysisInputError);
  });
});

describe('daysToFirstTherapy', () => {
  it('when episodes started on days 2 and 1, then 1', () => {
    expect(daysToFirstTherapy([{ startPostoperativeDay: 2 }, { startPostoperativeDay: 1 }])).toBe(1);
  });

  it('when therapy started on the day of surgery, then 0', () => {
    expect(daysToFirstTherapy([{ startPostoperativeDay: 0 }])).toBe(0);
  });

  it('when there are no episodes, then null (no therapy, not day 0)', () => {
    expect(daysToFirstTherapy([])).toBeNull();
  });

  it('when a start day is missing or fractional, then it throws naming the episode', () => {
    expect(() => daysToFirstTherapy([{ startPostoperativeDay: 1 }, {} as { startPostoperativeDay: number }])).toThrow(
      /episodes\[1\]\.startPostoperativeDay/,
    );
    expect(() => daysToFirstTherapy([{ startPostoperativeDay: 1.5 }])).toThrow(/whole number/);
  });
});

describe('adherence', () => {
  it('when 9 of 12 sessions were delivered, then 0.75', () => {
    expect(adherence(9, 12)).toBe(0.75);
  });

  it('when more sessions were delivered than prescribed, then capped at 1', () => {
    expect(adherence(15, 12)).toBe(1);
  });

  it('when none were delivered, then 0', () => {
    expect(adherence(0, 5)).toBe(0);
  });

  it('when none were prescribed, then null (undefined, not 0)', () => {
    expect(adherence(0, 0)).toBeNull();
    expect(adherence(3, 0)).toBeNull();
  });

  it('when a count is negative or missing, then it throws', () => {
    expect(() => adherence(-1, 5)).toThrow(AnalysisInputError);
    expect(() => adherence(1, undefined as unknown as number)).toThrow(/prescribed/);
  });
});

describe('followUpWindow and followUpClosed', () => {
  it('when surgery is 15 January 2024, then the window ends on day 30, 14 February', () => {
    // 16 remaining days of January (31 days) + 14 days of February = 30.
    expect(followUpWindow('2024-01-15')).toEqual({ start: '2024-01-15', end: '2024-02-14' });
  });

  it('when surgery is 20 December 2023, then the window ends 19 January 2024', () => {
    expect(followUpWindow('2023-12-20').end).toBe('2024-01-19');
  });

  it.each([
    ['2024-01-15', false], // day 0
    ['2024-02-14', false], // day 30: still open
    ['2024-02-15', true], // day 31: closed
  ])('when today is %s for surgery on 2024-01-15, then closed is %s', (today, closed) => {
    expect(followUpClosed('2024-01-15', today)).toBe(closed);
  });

  it('when today is missing, then it throws rather than reading the clock', () => {
    expect(() => followUpClosed('2024-01-15', undefined as unknown as string)).toThrow(/today/);
  });
});

describe('surveillanceMonth', () => {
  it('when the surgery date is 31 March 2024, then 2024-03', () => {
    expect(surveillanceMonth('2024-03-31')).toBe('2024-03');
  });

  it('when the surgery instant is 23:30 UTC on 31 March 2024, then the month depends on the network zone', () => {
    // Madrid is UTC+2 from 01:00 UTC that day (EU summer time): 01:30 on 1 April.
    expect(surveillanceMonth('2024-03-31T23:30:00Z', 'Europe/Madrid')).toBe('2024-04');
    // New York is UTC-4 (summer time since 10 March 2024): 19:30 on 31 March.
    expect(surveillanceMonth('2024-03-31T23:30:00Z', 'America/New_York')).toBe('2024-03');
  });

  it('when an instant comes without a zone, or the zone is unknown, then it throws', () => {
    expect(() => surveillanceMonth('2024-03-31T23:30:00Z')).toThrow(/timeZone/);
    expect(() => surveillanceMonth('2024-03-31T23:30:00Z', 'Mars/Olympus')).toThrow(/time zone/);
  });

  it('when the date is invalid, then it throws', () => {
    expect(() => surveillanceMonth('2024-13-01')).toThrow(AnalysisInputError);
  });
});
