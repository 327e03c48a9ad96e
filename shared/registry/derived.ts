/**
 * The derived measures every later screen uses, in one module: "any PPC", pneumonia by PNU1,
 * reintubation and ARDS (reported apart), length of stay, post-operative stay, patient-days,
 * days to first therapy, adherence, the 30-day follow-up window, the surveillance month and
 * which statuses count in analyses. The rules themselves are the pure functions of
 * analysis/clinical (one definition each, tested against their sources); this module applies
 * them to a registry case, and the SQL views `case_derived` and `case_completeness`
 * (server/registry/views.ts, migration Registry) compute the same in the database. A test
 * (tests/server/registry/views.test.ts) checks that both give the same answers.
 *
 * Note: shared/ imports analysis/ here on purpose, so that the client, the server and the
 * views share one implementation of each rule (see the decision log).
 */
import { ANALYSED_CASE_STATUSES, ANY_PPC_COMPONENTS, PPC_REPORTED_SEPARATELY, countsInAnalysis } from '../../analysis/clinical/ppc-composite.js';
import { bmi as bmiOf } from '../../analysis/clinical/body.js';
import {
  FOLLOW_UP_DAYS,
  adherence as adherenceOf,
  daysToFirstTherapy as firstTherapyDay,
  followUpClosed,
  followUpWindow,
  lengthOfStay,
  postoperativeStay,
  surveillanceMonth,
} from '../../analysis/clinical/stay.js';
import type { CaseStatus, PpcEventType } from '../clinical/codes.js';
import type { CaseDerived } from './record.js';

export { ANALYSED_CASE_STATUSES, ANY_PPC_COMPONENTS, PPC_REPORTED_SEPARATELY, FOLLOW_UP_DAYS, countsInAnalysis };

/** The derived measures as the data dictionary lists them (with the view column that computes each). */
export const DERIVED_MEASURES = [
  { variable: 'anyPpc', view: 'case_derived.any_ppc', label: 'Any post-operative pulmonary complication', unit: '', definition: `At least one event of: ${ANY_PPC_COMPONENTS.join(', ')}. Reintubation and ARDS are reported separately.`, source: 'Canet J et al., Anesthesiology 2010;113:1338-50; Jammer I et al., Eur J Anaesthesiol 2015;32:88-105' },
  { variable: 'pneumoniaNhsn', view: 'case_derived.pneumonia_nhsn', label: 'Pneumonia (CDC/NHSN PNU1)', unit: '', definition: 'At least one respiratory-infection event whose stored PNU1 evaluation is met.', source: 'CDC NHSN Patient Safety Component Manual 2022, ch. 6 (PNU1)' },
  { variable: 'reintubation', view: 'case_derived.reintubation', label: 'Reintubation', unit: '', definition: 'At least one reintubation event (outside the composite).', source: 'common practice (no source)' },
  { variable: 'ards', view: 'case_derived.ards', label: 'ARDS', unit: '', definition: 'At least one ARDS event (outside the composite).', source: 'Jammer I et al., Eur J Anaesthesiol 2015;32:88-105 (Berlin definition)' },
  { variable: 'lengthOfStayDays', view: 'case_derived.length_of_stay_days', label: 'Length of stay', unit: 'days', definition: 'Discharge date minus admission date, in calendar days (same day = 0).', source: 'common practice (no source)' },
  { variable: 'postoperativeStayDays', view: 'case_derived.postoperative_stay_days', label: 'Post-operative stay', unit: 'days', definition: 'Discharge date minus surgery date, in calendar days (same day = 0).', source: 'common practice (no source)' },
  { variable: 'patientDays', view: 'case_derived.patient_days', label: 'Post-operative patient-days', unit: 'days', definition: 'Midnights in hospital after surgery (= post-operative stay); the denominator of rates per 1,000 patient-days.', source: 'common practice (no source)' },
  { variable: 'daysToFirstTherapy', view: 'case_derived.days_to_first_therapy', label: 'Days to first therapy', unit: 'days', definition: 'Earliest post-operative day a therapy episode started.', source: 'common practice (no source)' },
  { variable: 'adherence', view: 'therapy_episodes (sessions_delivered / sessions_prescribed)', label: 'Therapy adherence', unit: 'fraction', definition: 'Sessions delivered / prescribed, capped at 1; empty when none prescribed.', source: 'common practice (no source)' },
  { variable: 'followUpWindowEnd', view: 'case_derived.follow_up_window_end', label: 'End of the 30-day follow-up window', unit: 'date', definition: `Surgery date + ${FOLLOW_UP_DAYS} days (day 0 to day ${FOLLOW_UP_DAYS} inclusive); closed from day ${FOLLOW_UP_DAYS + 1}.`, source: 'common practice (no source)' },
  { variable: 'surveillanceMonth', view: 'case_derived.surveillance_month', label: 'Surveillance month', unit: 'YYYY-MM', definition: 'Month of the surgery date in the network time zone.', source: 'common practice (no source)' },
  { variable: 'countsInAnalysis', view: 'case_derived.counts_in_analysis', label: 'Counts in analyses', unit: '', definition: `Status is ${ANALYSED_CASE_STATUSES.join(', ')} (never draft or withdrawn).`, source: 'common practice (no source)' },
  { variable: 'complete', view: 'case_completeness.complete', label: 'Complete', unit: '', definition: 'Passes the completeness rules (required fields per section, in the data dictionary).', source: 'common practice (no source)' },
] as const;

export interface DerivableCase {
  status: CaseStatus;
  admissionDate?: string | null;
  surgeryDate: string;
  dischargeDate?: string | null;
  heightCm?: number | null;
  weightKg?: number | null;
}
export interface DerivableEpisode { startPostoperativeDay?: number | null }
export interface DerivableEvent { type: PpcEventType; pneumoniaNhsnMet?: boolean }

/** A rule that cannot apply yet (a date still missing) gives null rather than an error. */
function orNull<T>(f: () => T): T | null {
  try {
    return f();
  } catch {
    return null;
  }
}

/** Post-operative patient-days of a case (midnights after surgery; null until discharged). */
export function patientDays(surgeryDate: string, dischargeDate: string | null | undefined): number | null {
  return dischargeDate ? orNull(() => postoperativeStay(surgeryDate, dischargeDate)) : null;
}

/** Adherence of one episode, or null when a count is missing or nothing was prescribed. */
export function episodeAdherence(e: { sessionsDelivered?: number | null; sessionsPrescribed?: number | null }): number | null {
  if (e.sessionsDelivered == null || e.sessionsPrescribed == null) return null;
  return orNull(() => adherenceOf(e.sessionsDelivered as number, e.sessionsPrescribed as number));
}

/**
 * The derived measures of one case, from its fields and its current (not removed) episodes and events.
 * @param today the current date in the network time zone (YYYY-MM-DD), for the follow-up window
 */
export function deriveCase(c: DerivableCase, episodes: readonly DerivableEpisode[], events: readonly DerivableEvent[], today: string): CaseDerived {
  const starts = episodes.filter((e) => e.startPostoperativeDay != null) as { startPostoperativeDay: number }[];
  const types = new Set(events.map((e) => e.type));
  return {
    bmi: c.heightCm != null && c.weightKg != null ? orNull(() => Math.round(bmiOf(c.heightCm as number, c.weightKg as number) * 10) / 10) : null,
    lengthOfStayDays: c.admissionDate && c.dischargeDate ? orNull(() => lengthOfStay(c.admissionDate as string, c.dischargeDate as string)) : null,
    postoperativeStayDays: patientDays(c.surgeryDate, c.dischargeDate),
    surveillanceMonth: surveillanceMonth(c.surgeryDate),
    followUpWindowEnd: followUpWindow(c.surgeryDate).end,
    followUpClosed: followUpClosed(c.surgeryDate, today),
    daysToFirstTherapy: orNull(() => firstTherapyDay(starts)),
    anyPpc: ANY_PPC_COMPONENTS.some((t) => types.has(t)),
    pneumoniaNhsn: events.some((e) => e.type === 'respiratory-infection' && e.pneumoniaNhsnMet === true),
    reintubation: types.has('reintubation'),
    ards: types.has('ards'),
    countsInAnalysis: countsInAnalysis(c.status),
  };
}

/** Today's calendar date in a time zone (YYYY-MM-DD); the caller passes the clock. */
// Building an Intl.DateTimeFormat costs about 0.1 ms; one per time zone is kept (many requests ask for "today").
const dayFormats = new Map<string, Intl.DateTimeFormat>();
export function todayIn(timeZone: string, now = new Date()): string {
  let f = dayFormats.get(timeZone);
  if (!f) dayFormats.set(timeZone, (f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' })));
  return f.format(now);
}
