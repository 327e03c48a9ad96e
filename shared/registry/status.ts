/**
 * The abstraction workflow: draft -> complete -> verified -> locked, withdrawal with a reason,
 * and who may make each move. The server enforces it; the client uses the same table to show
 * only the buttons a person may press.
 */
import { z } from 'zod';
import type { Role } from '../auth/roles.js';
import { CaseStatusSchema, type CaseStatus } from '../clinical/codes.js';
import { ReasonSchema } from './text.js';

export interface Transition {
  from: readonly CaseStatus[];
  to: CaseStatus;
  roles: readonly Role[];
  /** A reason is required and kept in the audit trail. */
  needsReason: boolean;
  /** The case must pass the completeness rules first. */
  needsComplete: boolean;
  label: string;
}

/**
 * Allowed moves. Verification is by a second person: the server also refuses the case's
 * creator or importer and anyone who changed it since its last verification. Locking happens
 * when the month is closed; an administrator may lock a single verified case.
 */
export const TRANSITIONS: readonly Transition[] = [
  { from: ['draft'], to: 'complete', roles: ['admin', 'abstractor'], needsReason: false, needsComplete: true, label: 'Mark complete' },
  { from: ['complete'], to: 'draft', roles: ['admin', 'abstractor'], needsReason: false, needsComplete: false, label: 'Back to draft' },
  { from: ['complete'], to: 'verified', roles: ['admin', 'abstractor', 'analyst'], needsReason: false, needsComplete: true, label: 'Verify' },
  { from: ['verified'], to: 'locked', roles: ['admin'], needsReason: false, needsComplete: true, label: 'Lock' },
  { from: ['draft', 'complete', 'verified'], to: 'withdrawn', roles: ['admin', 'abstractor'], needsReason: true, needsComplete: false, label: 'Withdraw' },
  { from: ['locked'], to: 'withdrawn', roles: ['admin'], needsReason: true, needsComplete: false, label: 'Withdraw (amendment)' },
  { from: ['withdrawn'], to: 'draft', roles: ['admin'], needsReason: true, needsComplete: false, label: 'Reinstate' },
];

export function findTransition(from: CaseStatus, to: CaseStatus): Transition | undefined {
  return TRANSITIONS.find((t) => t.to === to && t.from.includes(from));
}

/** Statuses in which the case's fields may be edited without an amendment. */
export const EDITABLE_STATUSES: readonly CaseStatus[] = ['draft', 'complete', 'verified'];

/** POST /api/cases/:id/status. */
export const StatusChangeSchema = z.strictObject({
  to: CaseStatusSchema,
  version: z.number({ error: 'send the version you read' }).int().min(1),
  reason: ReasonSchema.optional(),
});
export type StatusChange = z.infer<typeof StatusChangeSchema>;
