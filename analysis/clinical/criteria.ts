/**
 * Building blocks shared by the PPC definitions: one criterion evaluated over dated
 * observations within a span of days, and groups of criteria ("at least n of").
 */
import type { CriterionResult } from '../../shared/clinical/definition-results.js';
import { isoFromDayNumber } from './dates.js';
import type { DatedObservation } from './observation-dates.js';

/** An inclusive span of day numbers; `null` bounds mean open. */
export interface DaySpan {
  readonly start: number | null;
  readonly end: number | null;
}

export const inSpan = (span: DaySpan, day: number): boolean =>
  (span.start === null || day >= span.start) && (span.end === null || day <= span.end);

export function describeSpan(span: DaySpan): string {
  if (span.start === null && span.end === null) return 'in the record';
  if (span.start !== null && span.end !== null && span.start === span.end) return `on ${isoFromDayNumber(span.start)}`;
  if (span.end === null) return `on or after ${isoFromDayNumber(span.start as number)}`;
  if (span.start === null) return `on or before ${isoFromDayNumber(span.end)}`;
  return `between ${isoFromDayNumber(span.start)} and ${isoFromDayNumber(span.end)}`;
}

const MAX_LISTED = 3;

function list(items: readonly string[]): string {
  const shown = items.slice(0, MAX_LISTED).join('; ');
  return items.length > MAX_LISTED ? `${shown}; and ${items.length - MAX_LISTED} more` : shown;
}

/**
 * One criterion: met when any candidate observation inside the span qualifies.
 * `missing` when no candidate lies in the span (qualifying ones outside it are named),
 * `not-met` when candidates in the span do not qualify.
 */
export function evaluateCriterion<O extends DatedObservation>(args: {
  id: string;
  label: string;
  candidates: readonly O[];
  span: DaySpan;
  qualifies: (d: O) => boolean;
  describe: (d: O) => string;
  /** e.g. "above 38.0 °C"; used in the not-met reason. */
  threshold: string;
  /** Name of the evidence, for the missing reason: "temperature". */
  evidence: string;
  /** Name qualifying observations outside the span in the missing reason (default true). */
  mentionOutside?: boolean;
}): CriterionResult {
  const { id, label, candidates, span, qualifies, describe, threshold, evidence, mentionOutside = true } = args;
  const sorted = [...candidates].sort((a, b) => a.day - b.day || a.obs.id.localeCompare(b.obs.id));
  const inside = sorted.filter((d) => inSpan(span, d.day));
  const hits = inside.filter(qualifies);
  if (hits.length > 0) {
    return { id, label, met: true, status: 'met', reason: list(hits.map(describe)), observationIds: hits.map((d) => d.obs.id) };
  }
  if (inside.length > 0) {
    return {
      id,
      label,
      met: false,
      status: 'not-met',
      reason: `not ${threshold} ${describeSpan(span)}: ${list(inside.map(describe))}`,
      observationIds: [],
    };
  }
  const outside = mentionOutside ? sorted.filter(qualifies) : [];
  return {
    id,
    label,
    met: false,
    status: 'missing',
    reason:
      outside.length > 0
        ? `no ${evidence} recorded ${describeSpan(span)}; outside it: ${list(outside.map(describe))}`
        : `no ${evidence} recorded ${describeSpan(span)}`,
    observationIds: [],
  };
}

/** A criterion that does not apply to this patient (e.g. an age limit): never met. */
export function notApplicable(id: string, label: string, reason: string): CriterionResult {
  return { id, label, met: false, status: 'not-met', reason, observationIds: [] };
}

/** "At least `n` of" the member criteria. */
export function atLeast(id: string, label: string, n: number, members: readonly CriterionResult[]): CriterionResult {
  const met = members.filter((m) => m.met);
  const ok = met.length >= n;
  const status = ok ? 'met' : members.every((m) => m.status === 'missing') ? 'missing' : 'not-met';
  const names = (cs: readonly CriterionResult[]) => cs.map((c) => c.label).join(', ');
  const reason = ok
    ? `${met.length} of ${members.length} met (at least ${n} needed): ${names(met)}`
    : `${met.length} of ${members.length} met, at least ${n} needed${met.length ? `: ${names(met)}` : ''}`;
  return { id, label, met: ok, status, reason, observationIds: [...new Set(met.flatMap((m) => m.observationIds))] };
}

/** Criterion results from a condition computed elsewhere. */
export function fromCondition(
  id: string,
  label: string,
  met: boolean,
  status: CriterionResult['status'],
  reason: string,
  observationIds: readonly string[] = [],
): CriterionResult {
  return { id, label, met, status, reason, observationIds: [...observationIds] };
}
