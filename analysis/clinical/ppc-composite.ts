/**
 * The derived "any PPC" composite and the case statuses that count in analyses.
 *
 * Definition: any post-operative pulmonary complication = respiratory infection, respiratory
 * failure, bronchospasm, atelectasis, pleural effusion, pneumothorax or aspiration pneumonitis,
 * the composite of ARISCAT (Canet J et al., Anesthesiology 2010;113:1338-50) and of the
 * European Perioperative Clinical Outcome definitions (Jammer I et al., Eur J Anaesthesiol
 * 2015;32:88-105). Reintubation and ARDS are recorded and reported separately, outside it.
 */
import { CASE_STATUSES, PPC_EVENT_TYPES, type CaseStatus, type PpcEventType } from '../../shared/clinical/codes.js';
import { requireArray, requireObject, requireOneOf } from './require.js';

export const ANY_PPC_COMPONENTS = [
  'respiratory-infection',
  'respiratory-failure',
  'bronchospasm',
  'atelectasis',
  'pleural-effusion',
  'pneumothorax',
  'aspiration-pneumonitis',
] as const satisfies readonly PpcEventType[];
export type AnyPpcComponent = (typeof ANY_PPC_COMPONENTS)[number];

/** Recorded but outside the composite; reported on their own. */
export const PPC_REPORTED_SEPARATELY = ['reintubation', 'ards'] as const satisfies readonly PpcEventType[];

/**
 * Whether an event type is part of the "any PPC" composite.
 * @throws AnalysisInputError for an unknown event type
 * @example isAnyPpcComponent('atelectasis') // true; 'reintubation' -> false
 */
export function isAnyPpcComponent(type: PpcEventType): boolean {
  const t = requireOneOf('isAnyPpcComponent', 'type', type, PPC_EVENT_TYPES);
  return (ANY_PPC_COMPONENTS as readonly string[]).includes(t);
}

/**
 * Whether a case has any PPC: at least one of its events is a composite component.
 * @param events the case's outcome events (only `type` is read)
 * @throws AnalysisInputError when the list or an event's type is missing or unknown
 * @example hasAnyPpc([{ type: 'reintubation' }, { type: 'pneumothorax' }]) // true
 */
export function hasAnyPpc(events: readonly { readonly type: PpcEventType }[]): boolean {
  const fn = 'hasAnyPpc';
  const list = requireArray(fn, 'events', events);
  let any = false;
  list.forEach((e, i) => {
    requireObject(fn, `events[${i}]`, e);
    const t = requireOneOf(fn, `events[${i}].type`, e.type, PPC_EVENT_TYPES);
    if ((ANY_PPC_COMPONENTS as readonly string[]).includes(t)) any = true;
  });
  return any;
}

/** Case statuses that count in analyses; never draft or withdrawn (issue 3). */
export const ANALYSED_CASE_STATUSES = ['complete', 'verified', 'locked'] as const satisfies readonly CaseStatus[];

/**
 * Whether a case with this status counts in analyses.
 * @throws AnalysisInputError for an unknown status
 * @example countsInAnalysis('verified') // true; 'draft' -> false
 */
export function countsInAnalysis(status: CaseStatus): boolean {
  const s = requireOneOf('countsInAnalysis', 'status', status, CASE_STATUSES);
  return (ANALYSED_CASE_STATUSES as readonly string[]).includes(s);
}
