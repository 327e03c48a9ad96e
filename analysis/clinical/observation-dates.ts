/**
 * Validates outcome observations and places each on the calendar: its date, day number and
 * post-operative day, from whichever of `date` / `postoperativeDay` it carries.
 */
import { ObservationSchema, type Observation } from '../../shared/clinical/observations.js';
import { AnalysisInputError } from '../errors.js';
import { dayNumber, isoFromDayNumber } from './dates.js';
import { requireArray } from './require.js';

export interface DatedObservation<O extends Observation = Observation> {
  readonly obs: O;
  /** ISO calendar date. */
  readonly date: string;
  /** Days since 1970-01-01, for arithmetic. */
  readonly day: number;
  /** 0 = day of surgery. */
  readonly postoperativeDay: number;
}

/**
 * Parses every observation with the shared schema and dates it from the surgery date.
 * @throws AnalysisInputError naming `observations[i].field` for an invalid observation, a
 *   repeated id, or a date and post-operative day that disagree
 */
export function dateObservations(fn: string, observations: readonly Observation[], surgeryDate: string): DatedObservation[] {
  const surgery = dayNumber(fn, 'surgeryDate', surgeryDate);
  const list = requireArray(fn, 'observations', observations);
  const ids = new Set<string>();
  return list.map((raw, i) => {
    const parsed = ObservationSchema.safeParse(raw);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const at = issue.path.length ? `.${issue.path.map(String).join('.')}` : '';
      throw new AnalysisInputError(fn, `observations[${i}]${at}`, `is not valid: ${issue.message}`);
    }
    const obs = parsed.data;
    if (ids.has(obs.id)) throw new AnalysisInputError(fn, `observations[${i}].id`, `"${obs.id}" is used by two observations; give each its own id`);
    ids.add(obs.id);
    let day: number;
    if (obs.date !== undefined) {
      day = dayNumber(fn, `observations[${i}].date`, obs.date);
      if (obs.postoperativeDay !== undefined && obs.postoperativeDay !== day - surgery) {
        throw new AnalysisInputError(
          fn,
          `observations[${i}].postoperativeDay`,
          `(${obs.postoperativeDay}) disagrees with its date ${obs.date}, which is post-operative day ${day - surgery}; correct one of them`,
        );
      }
    } else {
      day = surgery + (obs.postoperativeDay as number);
    }
    return { obs, day, date: isoFromDayNumber(day), postoperativeDay: day - surgery };
  });
}

/** The dated observations of one kind. */
export function ofKind<K extends Observation['kind']>(
  list: readonly DatedObservation[],
  kind: K,
): DatedObservation<Extract<Observation, { kind: K }>>[] {
  return list.filter((d) => d.obs.kind === kind) as DatedObservation<Extract<Observation, { kind: K }>>[];
}
