import { describe, expect, it } from 'vitest';
import { TherapyEpisodeCreateSchema, TherapyEpisodeUpdateSchema, therapyContradictions } from '../../../shared/registry/therapy.js';
import { OutcomeEventCreateSchema } from '../../../shared/registry/outcome.js';

const paths = (r: { error?: { issues: { path: PropertyKey[] }[] } }) => (r.error?.issues ?? []).map((i) => i.path.join('.'));

describe('therapy episode schema', () => {
  it('when more sessions are delivered than prescribed, then a reason is required (issue 3)', () => {
    const e = { caseVersion: 1, modality: 'incentive-spirometry', sessionsPrescribed: 10, sessionsDelivered: 11 };
    expect(paths(TherapyEpisodeCreateSchema.safeParse(e))).toEqual(['deliveredAbovePrescribedReason']);
    expect(TherapyEpisodeCreateSchema.safeParse({ ...e, deliveredAbovePrescribedReason: 'extra session before discharge' }).success).toBe(true);
    // Equal counts need no reason.
    expect(TherapyEpisodeCreateSchema.safeParse({ ...e, sessionsDelivered: 10 }).success).toBe(true);
  });

  it('when the last session is before the first, or "none" is combined with an adverse event, then it is refused', () => {
    expect(therapyContradictions({ startPostoperativeDay: 3, endPostoperativeDay: 1 }).map((c) => c.path)).toEqual(['endPostoperativeDay']);
    expect(therapyContradictions({ adverseEvents: ['none', 'fatigue'] }).map((c) => c.path)).toEqual(['adverseEvents']);
  });

  it('when a start day is before surgery, then it is refused (therapy episodes are post-operative)', () => {
    expect(paths(TherapyEpisodeCreateSchema.safeParse({ caseVersion: 1, modality: 'pep', startPostoperativeDay: -1 }))).toEqual(['startPostoperativeDay']);
  });

  it('when the modality is unknown (CPAP for sleep apnoea is a risk factor, not an episode), then it is refused', () => {
    expect(paths(TherapyEpisodeCreateSchema.safeParse({ caseVersion: 1, modality: 'home-cpap' }))).toEqual(['modality']);
  });

  it('when an update changes one field, then the modality may be left out', () => {
    expect(TherapyEpisodeUpdateSchema.safeParse({ caseVersion: 2, flowLpm: 5 }).success).toBe(true);
  });
});

describe('outcome event schema', () => {
  it.each([
    [-1, false],
    [0, true],
    [30, true],
    [31, false],
  ])('when the onset is post-operative day %i, then accepted is %s (no onset before surgery; window day 0-30)', (day, ok) => {
    expect(OutcomeEventCreateSchema.safeParse({ caseVersion: 1, type: 'atelectasis', onsetPostoperativeDay: day }).success).toBe(ok);
  });

  it('when grade V (death) carries the disability suffix, then it is refused (Dindo 2004: the "d" suffix marks disability at discharge)', () => {
    expect(paths(OutcomeEventCreateSchema.safeParse({ caseVersion: 1, type: 'ards', onsetPostoperativeDay: 2, clavienDindo: 'V', clavienDindoDisability: true }))).toEqual(['clavienDindoDisability']);
  });

  it('when two observations share an id, then the second is named', () => {
    const obs = [{ id: 'a', kind: 'bronchodilator-given', postoperativeDay: 1 }, { id: 'a', kind: 'bronchodilator-given', postoperativeDay: 2 }];
    expect(paths(OutcomeEventCreateSchema.safeParse({ caseVersion: 1, type: 'bronchospasm', onsetPostoperativeDay: 1, observations: obs }))).toEqual(['observations.1.id']);
  });
});
