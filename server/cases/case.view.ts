/** Builds the case as the client sees it (shared/registry/record.ts `Case`). */
import type { SessionUser } from '../../shared/auth/user.js';
import type { PpcEventType } from '../../shared/clinical/codes.js';
import { caseCompleteness } from '../../shared/registry/completeness.js';
import { deriveCase, episodeAdherence } from '../../shared/registry/derived.js';
import type { Case, RegistryWarning } from '../../shared/registry/record.js';
import type { TherapyEpisode } from '../../shared/registry/therapy.js';
import type { OutcomeEvent } from '../../shared/registry/outcome.js';
import { loadEpisodes, loadEvents, otherCasesOfPatient, type CaseRecord, type Db, type EpisodeRecord, type EventRecord } from './case.repo.js';

const VERIFIER_ROLES = ['admin', 'abstractor', 'analyst'] as const;

/** Whether `user` may verify the case now (four-eyes rule), and if not, why. */
export function verificationVerdict(rec: CaseRecord, user: SessionUser): { allowed: boolean; reason: string | null } {
  if (!user.roles.some((r) => (VERIFIER_ROLES as readonly string[]).includes(r))) return { allowed: false, reason: 'your role does not verify cases' };
  if (rec.status !== 'complete') return { allowed: false, reason: `only a complete case can be verified (this one is ${rec.status})` };
  if (rec.createdBy === user.id) return { allowed: false, reason: rec.createdVia === 'import' ? 'you imported this case: another person must verify it' : 'you created this case: another person must verify it' };
  if (rec.editorsSinceVerification.includes(user.id)) return { allowed: false, reason: 'you changed this case since its last verification: another person must verify it' };
  return { allowed: true, reason: null };
}

export function episodeView(e: EpisodeRecord): TherapyEpisode {
  return {
    ...(e.fields as unknown as TherapyEpisode),
    id: e.id,
    caseId: e.caseId,
    adherence: episodeAdherence(e.fields as { sessionsDelivered?: number | null; sessionsPrescribed?: number | null }),
    warnings: e.warnings,
    createdAt: e.createdAt,
    updatedAt: e.updatedAt,
  };
}

export function eventView(e: EventRecord): OutcomeEvent {
  return {
    id: e.id, caseId: e.caseId, type: e.type as PpcEventType, onsetPostoperativeDay: e.onsetPostoperativeDay, clavienDindo: e.clavienDindo as OutcomeEvent['clavienDindo'],
    clavienDindoDisability: e.clavienDindoDisability, observations: e.observations, notes: e.notes, definition: e.definition as OutcomeEvent['definition'],
    definitionVersion: e.definitionVersion, evaluations: e.evaluations as OutcomeEvent['evaluations'], createdAt: e.createdAt, updatedAt: e.updatedAt,
  };
}

export async function buildCaseView(db: Db, rec: CaseRecord, user: SessionUser, today: string): Promise<Case> {
  const [episodes, events] = await Promise.all([loadEpisodes(db, rec.id), loadEvents(db, rec.id)]);
  const others = rec.identifierHash ? await otherCasesOfPatient(db, rec.siteId, rec.identifierHash, rec.id) : [];
  const f = rec.fields;
  const warnings: RegistryWarning[] = [...rec.warnings];
  const earlier = others.filter((o) => o.surgeryDate !== f.surgeryDate);
  if (earlier.length) warnings.push({ path: 'localIdentifier', code: 'returning-patient', message: `the same patient has other cases at this site: ${earlier.map((o) => o.registryNumber).join(', ')}` });
  if (rec.possibleDuplicate) warnings.push({ path: 'localIdentifier', code: 'possible-duplicate', message: 'saved although the same patient already has a case on this surgery date; check it is not entered twice' });
  return {
    ...f,
    id: rec.id,
    registryNumber: rec.registryNumber,
    siteId: rec.siteId,
    siteCode: rec.siteCode,
    status: rec.status,
    version: rec.version,
    ariscat: rec.ariscatPoints != null && rec.ariscatClass ? { points: rec.ariscatPoints, riskClass: rec.ariscatClass } : null,
    derived: deriveCase(
      { status: rec.status, admissionDate: f.admissionDate, surgeryDate: f.surgeryDate as string, dischargeDate: f.dischargeDate, heightCm: f.heightCm, weightKg: f.weightKg },
      episodes.map((e) => ({ startPostoperativeDay: e.fields.startPostoperativeDay as number | null })),
      events.map((e) => ({ type: e.type as PpcEventType, pneumoniaNhsnMet: e.pneumoniaNhsnMet })),
      today,
    ),
    completeness: caseCompleteness(f, episodes.map((e) => ({ id: e.id, ...e.fields })), events.map((e) => ({ ...e }))),
    hasLocalIdentifier: !!rec.identifierHash,
    otherCasesOfPatient: others.map((o) => o.registryNumber),
    possibleDuplicate: rec.possibleDuplicate,
    createdVia: rec.createdVia,
    createdBy: rec.createdByEmail,
    createdAt: rec.createdAt,
    updatedAt: rec.updatedAt,
    verifiedBy: rec.verifiedByEmail,
    verifiedAt: rec.verifiedAt,
    lockedAt: rec.lockedAt,
    withdrawnReason: rec.withdrawnReason,
    canVerify: verificationVerdict(rec, user),
    therapy: episodes.map(episodeView),
    outcomes: events.map(eventView),
    warnings,
  };
}
