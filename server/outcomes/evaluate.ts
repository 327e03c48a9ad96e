/**
 * Applies the published definitions (analysis/clinical) to one outcome event and records each
 * result with the definition's name and version:
 * - CDC/NHSN PNU1 (2022) for respiratory-infection events (pneumonia surveillance definition);
 * - EPCO (Jammer 2015) for every event: met when the event's own component is met (or, for
 *   reintubation and ARDS, which are not EPCO components here, when any component is);
 * - Melbourne Group Scale (version 3) for every event.
 * The event is "judged under" PNU1 when it is a respiratory infection, else under EPCO.
 * An observation that cannot be placed (date and post-operative day disagree, ...) is bad
 * input (a 400 naming it); a case field the definition needs but the case lacks (admission
 * date, age) is stored as the evaluation's error and shown, not thrown.
 */
import { AnalysisInputError } from '../../analysis/errors.js';
import { pneumoniaNhsnPnu1, PNU1_DEFINITION, PNU1_SOURCE, PNU1_VERSION } from '../../analysis/clinical/pneumonia-nhsn.js';
import { ppcEpco, EPCO_DEFINITION, EPCO_SOURCE, EPCO_VERSION } from '../../analysis/clinical/ppc-epco.js';
import { melbourneGroupScale, MGS_DEFINITION, MGS_SOURCE, MGS_VERSION } from '../../analysis/clinical/melbourne-group-scale.js';
import type { Observation } from '../../shared/clinical/observations.js';
import { QUANTITIES, toStoredUnit, type MeasuredQuantity } from '../../shared/clinical/units.js';
import type { PpcEventType } from '../../shared/clinical/codes.js';
import type { DefinitionEvaluation, DefinitionId } from '../../shared/registry/outcome.js';
import type { ErrorField } from '../../shared/api/error.js';

export interface EvaluationCase {
  admissionDate: string | null | undefined;
  surgeryDate: string;
  age: number | null | undefined;
  copd: boolean | null | undefined;
  heartFailure: boolean | null | undefined;
}

export class ObservationInputError extends Error {
  constructor(readonly fields: ErrorField[]) {
    super(fields.map((f) => `${f.path} ${f.message}`).join('; '));
  }
}

const QUANTITY_OF: Partial<Record<Observation['kind'], MeasuredQuantity>> = { 'temperature-max': 'temperature', wbc: 'wbc', 'pf-ratio': 'pf-ratio', pao2: 'pao2' };

/** Measured observations converted to the stored unit (°C, per mm3, mmHg) by shared/clinical/units.ts. */
export function normaliseObservations(list: readonly Observation[]): Observation[] {
  return list.map((o) => {
    const q = QUANTITY_OF[o.kind];
    if (!q || !('value' in o)) return o;
    const m = o as Observation & { value: number; unit: Parameters<typeof toStoredUnit>[2] };
    return { ...m, value: toStoredUnit(q, m.value, m.unit), unit: QUANTITIES[q].stored } as Observation;
  });
}

/** The current version of each definition (a stored result with another version is re-applied on review). */
export const CURRENT_DEFINITION_VERSIONS: Record<DefinitionId, { name: string; version: string; source: string }> = {
  'nhsn-pnu1': { name: PNU1_DEFINITION, version: PNU1_VERSION, source: PNU1_SOURCE },
  epco: { name: EPCO_DEFINITION, version: EPCO_VERSION, source: EPCO_SOURCE },
  melbourne: { name: MGS_DEFINITION, version: MGS_VERSION, source: MGS_SOURCE },
};

/** `observations[2].date` -> `observations.2.date`, the form's field path. */
const fieldPath = (f: string) => f.replace(/\[(\d+)\]/g, '.$1');

function run(definition: DefinitionId, name: string, version: string, source: string, at: string, f: () => { met: boolean; result: unknown }): DefinitionEvaluation {
  try {
    const r = f();
    return { definition, name, version, source, met: r.met, result: r.result, error: null, evaluatedAt: at };
  } catch (e) {
    if (e instanceof AnalysisInputError && e.field.startsWith('observations')) throw new ObservationInputError([{ path: fieldPath(e.field), message: e.message.replace(`${e.fn}: ${e.field} `, '') }]);
    if (e instanceof AnalysisInputError) return { definition, name, version, source, met: false, result: null, error: `not evaluated: ${e.message.replace(`${e.fn}: `, '')}`, evaluatedAt: at };
    throw e;
  }
}

export interface EventEvaluation {
  evaluations: DefinitionEvaluation[];
  definition: DefinitionId;
  definitionVersion: string;
  pneumoniaNhsnMet: boolean;
  /** PNU1 date of event (for the repeat infection timeframe of later events). */
  pneumoniaDateOfEvent: string | null;
}

export function evaluateEvent(
  event: { type: PpcEventType; observations: readonly Observation[] },
  kase: EvaluationCase,
  opts: { previousPneumoniaDateOfEvent?: string | null; at?: string } = {},
): EventEvaluation {
  const at = opts.at ?? new Date().toISOString();
  const evaluations: DefinitionEvaluation[] = [];
  let dateOfEvent: string | null = null;
  if (event.type === 'respiratory-infection') {
    evaluations.push(run('nhsn-pnu1', PNU1_DEFINITION, PNU1_VERSION, PNU1_SOURCE, at, () => {
      const r = pneumoniaNhsnPnu1({
        observations: event.observations,
        admissionDate: kase.admissionDate as string,
        surgeryDate: kase.surgeryDate,
        ageYears: kase.age as number,
        underlyingCardiacOrPulmonaryDisease: kase.copd == null && kase.heartFailure == null ? (undefined as unknown as boolean) : !!(kase.copd || kase.heartFailure),
        previousPneumoniaDateOfEvent: opts.previousPneumoniaDateOfEvent ?? null,
      });
      dateOfEvent = r.dateOfEvent;
      return { met: r.met && r.withinRepeatInfectionTimeframe !== true, result: r };
    }));
  }
  evaluations.push(run('epco', EPCO_DEFINITION, EPCO_VERSION, EPCO_SOURCE, at, () => {
    const r = ppcEpco({ observations: event.observations, surgeryDate: kase.surgeryDate });
    const own = r.components.find((c) => c.component === event.type);
    return { met: own ? own.met : r.met, result: r };
  }));
  evaluations.push(run('melbourne', MGS_DEFINITION, MGS_VERSION, MGS_SOURCE, at, () => {
    const r = melbourneGroupScale({ observations: event.observations, surgeryDate: kase.surgeryDate });
    return { met: r.met, result: r };
  }));
  const primary = evaluations[0];
  return {
    evaluations,
    definition: primary.definition,
    definitionVersion: primary.version,
    pneumoniaNhsnMet: event.type === 'respiratory-infection' && evaluations[0].definition === 'nhsn-pnu1' && evaluations[0].met,
    pneumoniaDateOfEvent: dateOfEvent,
  };
}
