/**
 * Outcome events of a case: add, change, remove (never deleted). The definitions are
 * evaluated on every save and stored with their name and version; each save raises the case version.
 */
import type { EntityManager } from 'typeorm';
import type { Observation } from '../../shared/clinical/observations.js';
import type { PpcEventType } from '../../shared/clinical/codes.js';
import type { Case } from '../../shared/registry/record.js';
import type { OutcomeEventCreate, OutcomeEventUpdate, DefinitionEvaluation } from '../../shared/registry/outcome.js';
import type { RecordRemove } from '../../shared/registry/therapy.js';
import { writeCase, type Actor } from '../registry/case-write.js';
import { validationError } from '../registry/validation.js';
import { notFound } from '../http/errors.js';
import { loadEvent, loadEvents, type CaseRecord } from '../cases/case.repo.js';
import { buildCaseView } from '../cases/case.view.js';
import { getCaseView, today, type Services } from '../cases/case.service.js';
import { evaluateEvent, normaliseObservations, ObservationInputError, type EventEvaluation } from './evaluate.js';

const view = (services: Services, actor: Actor) => (db: EntityManager, rec: CaseRecord) => buildCaseView(db, rec, actor.user, today(services.config));

/** The latest PNU1 date of event among the case's other events before `beforeDate` (repeat infection timeframe). */
export function previousPneumonia(others: { evaluations: unknown[] }[], beforeDate: string | null): string | null {
  const dates = others
    .flatMap((o) => (o.evaluations as DefinitionEvaluation[]).filter((e) => e.definition === 'nhsn-pnu1' && e.met))
    .map((e) => (e.result as { dateOfEvent?: string | null })?.dateOfEvent ?? null)
    .filter((d): d is string => !!d && (!beforeDate || d < beforeDate))
    .sort();
  return dates.length ? dates[dates.length - 1] : null;
}

/** Evaluates an event in its case (two passes when PNU1 is met, for the repeat infection timeframe). */
export function evaluateInCase(type: PpcEventType, observations: Observation[], kase: CaseRecord, others: { evaluations: unknown[] }[]): EventEvaluation {
  const k = { admissionDate: kase.fields.admissionDate, surgeryDate: kase.fields.surgeryDate as string, age: kase.fields.age, copd: kase.fields.copd, heartFailure: kase.fields.heartFailure };
  try {
    const first = evaluateEvent({ type, observations }, k);
    const prev = first.pneumoniaDateOfEvent ? previousPneumonia(others, first.pneumoniaDateOfEvent) : null;
    return prev ? evaluateEvent({ type, observations }, k, { previousPneumoniaDateOfEvent: prev }) : first;
  } catch (e) {
    if (e instanceof ObservationInputError) throw validationError(e.fields, 'outcome event');
    throw e;
  }
}

const metSummary = (ev: EventEvaluation) => Object.fromEntries(ev.evaluations.map((e) => [`${e.definition} ${e.version}`, e.error ? 'not evaluated' : e.met ? 'met' : 'not met']));

export async function addEvent(services: Services, caseId: string, input: OutcomeEventCreate, actor: Actor): Promise<Case> {
  const { caseVersion, amendmentReason, ...fields } = input;
  await writeCase(services.ds, { caseId, actor, expectedVersion: caseVersion, amendmentReason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const observations = normaliseObservations(fields.observations);
    const ev = evaluateInCase(fields.type, observations, current, await loadEvents(tx, current.id));
    const [row] = await tx.query(
      `INSERT INTO outcome_events (case_id, type, onset_postoperative_day, clavien_dindo, clavien_dindo_disability, observations, notes, definition, definition_version, evaluations, pneumonia_nhsn_met, created_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12) RETURNING id`,
      [current.id, fields.type, fields.onsetPostoperativeDay, fields.clavienDindo ?? null, fields.clavienDindoDisability ?? null, JSON.stringify(observations), fields.notes ?? null,
        ev.definition, ev.definitionVersion, JSON.stringify(ev.evaluations), ev.pneumoniaNhsnMet, actor.user.id],
    );
    const f = `outcomes.${row.id}`;
    const details = { eventId: row.id };
    const audit = [
      { action: 'outcome-added', field: `${f}.type`, newValue: fields.type, details },
      { action: 'outcome-added', field: `${f}.onsetPostoperativeDay`, newValue: fields.onsetPostoperativeDay, details },
      ...(fields.clavienDindo ? [{ action: 'outcome-added', field: `${f}.clavienDindo`, newValue: fields.clavienDindo, details }] : []),
      ...(fields.clavienDindoDisability != null ? [{ action: 'outcome-added', field: `${f}.clavienDindoDisability`, newValue: fields.clavienDindoDisability, details }] : []),
      ...(fields.notes ? [{ action: 'outcome-added', field: `${f}.notes`, newValue: fields.notes, details }] : []),
      { action: 'outcome-added', field: `${f}.observations`, newValue: observations, details },
      { action: 'outcome-evaluated', field: `${f}.evaluations`, newValue: metSummary(ev), details },
    ];
    return { audit };
  });
  return getCaseView(services, caseId, actor.user);
}

export async function updateEvent(services: Services, caseId: string, eventId: string, input: OutcomeEventUpdate, actor: Actor): Promise<Case> {
  const { caseVersion, amendmentReason, ...changes } = input;
  await writeCase(services.ds, { caseId, actor, expectedVersion: caseVersion, amendmentReason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const existing = await loadEvent(tx, current.id, eventId);
    if (!existing) throw notFound('the outcome event');
    const next = {
      type: (changes.type ?? existing.type) as PpcEventType,
      onsetPostoperativeDay: changes.onsetPostoperativeDay ?? existing.onsetPostoperativeDay,
      clavienDindo: changes.clavienDindo !== undefined ? changes.clavienDindo : existing.clavienDindo,
      clavienDindoDisability: changes.clavienDindoDisability !== undefined ? changes.clavienDindoDisability : existing.clavienDindoDisability,
      notes: changes.notes !== undefined ? changes.notes : existing.notes,
      observations: changes.observations ? normaliseObservations(changes.observations) : (existing.observations as Observation[]),
    };
    if (next.clavienDindo === 'V' && next.clavienDindoDisability) throw validationError([{ path: 'clavienDindoDisability', message: 'grade V (death) takes no disability suffix' }], 'outcome event');
    const others = (await loadEvents(tx, current.id)).filter((e) => e.id !== eventId);
    const ev = evaluateInCase(next.type, next.observations, current, others);
    const f = `outcomes.${eventId}`;
    const details = { eventId };
    const audit: { action: string; field: string; oldValue: unknown; newValue: unknown; details: Record<string, unknown> }[] = [];
    const before: Record<string, unknown> = { type: existing.type, onsetPostoperativeDay: existing.onsetPostoperativeDay, clavienDindo: existing.clavienDindo, clavienDindoDisability: existing.clavienDindoDisability, notes: existing.notes, observations: existing.observations };
    for (const k of Object.keys(next) as (keyof typeof next)[]) {
      if (JSON.stringify(before[k] ?? null) !== JSON.stringify(next[k] ?? null)) audit.push({ action: 'outcome-changed', field: `${f}.${k}`, oldValue: before[k] ?? null, newValue: next[k] ?? null, details });
    }
    if (!audit.length) return { audit };
    const oldSummary = Object.fromEntries((existing.evaluations as DefinitionEvaluation[]).map((e) => [`${e.definition} ${e.version}`, e.error ? 'not evaluated' : e.met ? 'met' : 'not met']));
    const newSummary = metSummary(ev);
    if (JSON.stringify(oldSummary) !== JSON.stringify(newSummary)) audit.push({ action: 'outcome-evaluated', field: `${f}.evaluations`, oldValue: oldSummary, newValue: newSummary, details });
    await tx.query(
      `UPDATE outcome_events SET type = $2, onset_postoperative_day = $3, clavien_dindo = $4, clavien_dindo_disability = $5, notes = $6, observations = $7,
              definition = $8, definition_version = $9, evaluations = $10, pneumonia_nhsn_met = $11, updated_at = now() WHERE id = $1`,
      [eventId, next.type, next.onsetPostoperativeDay, next.clavienDindo, next.clavienDindoDisability, next.notes, JSON.stringify(next.observations), ev.definition, ev.definitionVersion, JSON.stringify(ev.evaluations), ev.pneumoniaNhsnMet],
    );
    return { audit };
  });
  return getCaseView(services, caseId, actor.user);
}

export async function removeEvent(services: Services, caseId: string, eventId: string, input: RecordRemove, actor: Actor): Promise<Case> {
  await writeCase(services.ds, { caseId, actor, expectedVersion: input.caseVersion, amendmentReason: input.reason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const existing = await loadEvent(tx, current.id, eventId);
    if (!existing) throw notFound('the outcome event');
    await tx.query(`UPDATE outcome_events SET removed_at = now(), removed_by = $2, removed_reason = $3 WHERE id = $1`, [eventId, actor.user.id, input.reason]);
    return { audit: [{ action: 'outcome-removed', field: `outcomes.${eventId}`, oldValue: existing.type, newValue: null, details: { eventId, reason: input.reason } }] };
  });
  return getCaseView(services, caseId, actor.user);
}
