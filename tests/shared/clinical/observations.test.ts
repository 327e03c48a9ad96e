/**
 * Outcome observation schemas: each observation needs a date or post-operative day; measured
 * values take only their quantity's units and must be possible (ranges: common practice, no
 * source); "no abnormality" cannot sit beside a finding.
 */
import { describe, expect, it } from 'vitest';
import { ObservationListSchema, ObservationSchema } from '../../../shared/clinical/observations.js';

describe('ObservationSchema', () => {
  it('when a chest image has a date and findings, then it is accepted', () => {
    const r = ObservationSchema.safeParse({
      id: 'a',
      kind: 'chest-imaging',
      date: '2024-03-05',
      modality: 'radiograph',
      findings: [{ type: 'consolidation', course: 'new' }],
      definitive: true,
    });
    expect(r.success).toBe(true);
  });

  it('when an observation has neither a date nor a post-operative day, then it is rejected on date', () => {
    const r = ObservationSchema.safeParse({ id: 'a', kind: 'bronchodilator-given' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['date']);
  });

  it('when only a post-operative day is given, then it is accepted', () => {
    expect(ObservationSchema.safeParse({ id: 'a', kind: 'bronchodilator-given', postoperativeDay: 2 }).success).toBe(true);
  });

  it('when the date is not a calendar date, then it is rejected', () => {
    expect(ObservationSchema.safeParse({ id: 'a', kind: 'bronchodilator-given', date: '2024-02-30' }).success).toBe(false);
  });

  it('when "no abnormality" is combined with a finding, then it is rejected', () => {
    const r = ObservationSchema.safeParse({
      id: 'a',
      kind: 'chest-imaging',
      postoperativeDay: 1,
      modality: 'ct',
      findings: [{ type: 'none' }, { type: 'effusion' }],
    });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['findings']);
  });

  it('when a temperature is 38.5 in °F, then it is rejected as impossible (3.6 °C)', () => {
    const r = ObservationSchema.safeParse({ id: 't', kind: 'temperature-max', postoperativeDay: 1, value: 38.5, unit: 'degF' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['value']);
  });

  it('when a temperature comes in mmHg, then the unit is rejected', () => {
    const r = ObservationSchema.safeParse({ id: 't', kind: 'temperature-max', postoperativeDay: 1, value: 38.5, unit: 'mmHg' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['unit']);
  });

  it('when a WBC is 12 x10^9/L or 12,000 per mm3, then both are accepted', () => {
    expect(ObservationSchema.safeParse({ id: 'w', kind: 'wbc', which: 'highest', date: '2024-03-05', value: 12, unit: '10^9/L' }).success).toBe(true);
    expect(ObservationSchema.safeParse({ id: 'w', kind: 'wbc', which: 'highest', date: '2024-03-05', value: 12000, unit: 'per-mm3' }).success).toBe(true);
  });

  it('when SpO2 is above 100%, then it is rejected', () => {
    expect(ObservationSchema.safeParse({ id: 's', kind: 'spo2', date: '2024-03-05', percent: 101, breathing: 'room-air' }).success).toBe(false);
  });

  it('when the kind is unknown, then it is rejected', () => {
    expect(ObservationSchema.safeParse({ id: 'x', kind: 'mood', date: '2024-03-05' }).success).toBe(false);
  });
});

describe('ObservationListSchema', () => {
  it('when two observations share an id, then the second is rejected', () => {
    const r = ObservationListSchema.safeParse([
      { id: 'a', kind: 'bronchodilator-given', postoperativeDay: 1 },
      { id: 'a', kind: 'bronchodilator-given', postoperativeDay: 2 },
    ]);
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual([1, 'id']);
  });
});
