/**
 * Live evaluation of an outcome event's evidence with the same definition functions the
 * server stores results from: CDC/NHSN PNU1 for a respiratory infection, the EPCO component of
 * the event's type, and the Melbourne Group Scale. Observations still being typed (not yet
 * valid under the shared ObservationSchema) are left out and counted.
 */
import { melbourneGroupScale } from '../../../analysis/clinical/melbourne-group-scale.js';
import { pneumoniaNhsnPnu1 } from '../../../analysis/clinical/pneumonia-nhsn.js';
import { ppcEpco } from '../../../analysis/clinical/ppc-epco.js';
import type { CriterionResult, EpcoComponent } from '../../../shared/clinical/definition-results.js';
import { EpcoComponentSchema } from '../../../shared/clinical/definition-results.js';
import { ObservationSchema, type Observation } from '../../../shared/clinical/observations.js';
import type { PpcEventType } from '../../../shared/clinical/codes.js';

export interface DefinitionView {
  id: 'nhsn-pnu1' | 'epco' | 'melbourne';
  name: string;
  version: string;
  source: string;
  met: boolean | null;
  /** One line: what decided the result. */
  summary: string;
  criteria: CriterionResult[];
  /** Why it could not be evaluated yet. */
  error: string | null;
}

export interface EventContext {
  surgeryDate?: string | null;
  admissionDate?: string | null;
  age?: number | null;
  copd?: boolean | null;
  heartFailure?: boolean | null;
}

export function validObservations(raw: readonly unknown[]): { valid: Observation[]; invalid: number } {
  const valid: Observation[] = [];
  let invalid = 0;
  for (const o of raw) {
    const r = ObservationSchema.safeParse(o);
    if (r.success) valid.push(r.data);
    else invalid++;
  }
  return { valid, invalid };
}

const failed = (id: DefinitionView['id'], name: string, error: string): DefinitionView => ({ id, name, version: '', source: '', met: null, summary: '', criteria: [], error });

export function evaluateEvent(type: PpcEventType | null | undefined, observations: readonly unknown[], c: EventContext): { views: DefinitionView[]; invalid: number } {
  const { valid, invalid } = validObservations(observations);
  const views: DefinitionView[] = [];
  if (!type) return { views, invalid };
  if (!c.surgeryDate) return { views: [failed('epco', 'Definitions', 'enter the surgery date first: observations are placed on post-operative days from it')], invalid };
  if (type === 'respiratory-infection') {
    try {
      if (!c.admissionDate) throw new Error('enter the admission date: PNU1 counts hospital days from it (present on admission)');
      if (c.age == null) throw new Error('enter the age: PNU1 has criteria for patients over 70');
      const r = pneumoniaNhsnPnu1({ observations: valid, admissionDate: c.admissionDate, surgeryDate: c.surgeryDate, ageYears: c.age, underlyingCardiacOrPulmonaryDisease: !!(c.copd || c.heartFailure) });
      views.push({
        id: 'nhsn-pnu1', name: r.definition, version: r.version, source: r.source, met: r.met, criteria: r.criteria, error: null,
        summary: r.met
          ? `Met; date of event ${r.dateOfEvent}${r.presentOnAdmission ? ', present on admission (not healthcare-associated)' : r.healthcareAssociated ? ', healthcare-associated' : ''}${r.withinRepeatInfectionTimeframe ? '; within the repeat infection timeframe of an earlier pneumonia' : ''}`
          : r.windowStart ? `Not met within the infection window ${r.windowStart} to ${r.windowEnd}` : 'Not met: no qualifying chest image yet',
      });
    } catch (err) {
      views.push(failed('nhsn-pnu1', 'CDC/NHSN PNU1', (err as Error).message));
    }
  }
  try {
    const r = ppcEpco({ observations: valid, surgeryDate: c.surgeryDate });
    const component = EpcoComponentSchema.safeParse(type);
    const comp = component.success ? r.components.find((x) => x.component === (component.data as EpcoComponent)) : undefined;
    if (comp) {
      views.push({ id: 'epco', name: `${r.definition}: ${comp.label}`, version: r.version, source: r.source, met: comp.met, criteria: comp.criteria, error: null, summary: comp.met ? `Met from post-operative day ${comp.onsetPostoperativeDay}` : 'Not met on the evidence recorded' });
    } else {
      views.push({ id: 'epco', name: r.definition, version: r.version, source: r.source, met: null, criteria: [], error: null, summary: `EPCO has no component for this type (reported separately); components met on this evidence: ${r.components.filter((x) => x.met).map((x) => x.label).join(', ') || 'none'}` });
    }
  } catch (err) {
    views.push(failed('epco', 'EPCO', (err as Error).message));
  }
  try {
    const r = melbourneGroupScale({ observations: valid, surgeryDate: c.surgeryDate });
    const best = r.days.reduce<(typeof r.days)[number] | null>((b, d) => (!b || d.criteriaMet > b.criteriaMet ? d : b), null);
    views.push({
      id: 'melbourne', name: r.definition, version: r.version, source: r.source, met: r.met, criteria: best?.criteria ?? [], error: null,
      summary: r.met ? `Met on post-operative day ${r.firstPostoperativeDayMet} (4 or more criteria on one day)` : `Not met: at most ${r.maxCriteriaMet} of the 4 needed criteria on one day${best ? ` (day ${best.postoperativeDay}, shown below)` : ''}`,
    });
  } catch (err) {
    views.push(failed('melbourne', 'Melbourne Group Scale', (err as Error).message));
  }
  return { views, invalid };
}

/** The definition results the server stored with an event, in the same view shape. */
export function storedViews(type: PpcEventType, evaluations: readonly { definition: string; name: string; version: string; source: string; met: boolean; result: unknown; error: string | null }[]): DefinitionView[] {
  return evaluations.map((e) => {
    const id = e.definition as DefinitionView['id'];
    const base = { id, name: e.name, version: e.version, source: e.source, met: e.error ? null : e.met, error: e.error, criteria: [] as CriterionResult[], summary: e.met ? 'Met' : 'Not met' };
    if (e.error || !e.result) return base;
    const r = e.result as Record<string, unknown>;
    if (id === 'nhsn-pnu1') return { ...base, criteria: (r.criteria as CriterionResult[]) ?? [], summary: e.met ? `Met; date of event ${String(r.dateOfEvent)}` : 'Not met' };
    if (id === 'epco') {
      const comp = ((r.components as { component: string; label: string; met: boolean; criteria: CriterionResult[]; onsetPostoperativeDay: number | null }[]) ?? []).find((c) => c.component === type);
      return comp ? { ...base, name: `${e.name}: ${comp.label}`, met: comp.met, criteria: comp.criteria, summary: comp.met ? `Met from post-operative day ${comp.onsetPostoperativeDay}` : 'Not met' } : base;
    }
    const days = (r.days as { postoperativeDay: number; criteriaMet: number; criteria: CriterionResult[] }[]) ?? [];
    const best = days.reduce<(typeof days)[number] | null>((b, d) => (!b || d.criteriaMet > b.criteriaMet ? d : b), null);
    return { ...base, criteria: best?.criteria ?? [], summary: e.met ? `Met on post-operative day ${String(r.firstPostoperativeDayMet)}` : `Not met: at most ${String(r.maxCriteriaMet)} of the 4 needed criteria on one day` };
  });
}
