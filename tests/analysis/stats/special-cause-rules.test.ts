import { describe, expect, it } from 'vitest';
import { SPECIAL_CAUSE_RULES } from '../../../analysis/index.js';
import { specialCauseSignals, type RulePoint } from '../../../analysis/stats/special-cause-rules.js';

/** Points around centre 0 with sigma 1, limits at +-3: `outside` strictly beyond them. */
const pts = (values: number[]): RulePoint[] => values.map((value) => ({ value, centre: 0, sigma: 1, outside: Math.abs(value) > 3 }));
const rules = (values: number[]) => specialCauseSignals(pts(values));

// Rules as listed in Provost LP, Murray SK, The Health Care Data Guide (2011), ch. 5 (common practice
// for Shewhart charts; the same rules as the Western Electric Statistical Quality Control Handbook, 1956).
describe('special-cause rules', () => {
  it('when the rule list is read, then it has five stable ids with plain-words descriptions', () => {
    expect(SPECIAL_CAUSE_RULES.map((r) => r.id)).toEqual([
      'outside-3-sigma',
      'eight-one-side',
      'six-trend',
      'two-of-three-beyond-2-sigma',
      'fifteen-within-1-sigma',
    ]);
    for (const r of SPECIAL_CAUSE_RULES) expect(r.description.length).toBeGreaterThan(20);
  });

  it('when one point lies beyond 3 sigma, then outside-3-sigma fires for that point only', () => {
    expect(rules([0.5, -0.5, 3.5, 0.5, -3.01])).toEqual([
      { rule: 'outside-3-sigma', start: 2, end: 2 },
      { rule: 'outside-3-sigma', start: 4, end: 4 },
    ]);
  });

  it('when a point is exactly on a limit, then it is not outside (strictly beyond only)', () => {
    expect(rules([3, -3]).filter((s) => s.rule === 'outside-3-sigma')).toEqual([]);
  });

  it('when eight points in a row are on one side, then eight-one-side spans them; seven do not fire', () => {
    expect(rules([0.5, 0.4, 0.3, 0.5, 0.4, 0.3, 0.5, -0.2])).toEqual([]);
    expect(rules([-0.1, 0.5, 0.4, 0.3, 0.5, 0.4, 0.3, 0.5, 0.2, -0.2])).toEqual([{ rule: 'eight-one-side', start: 1, end: 8 }]);
  });

  it('when a point is exactly on the centre line, then it neither breaks nor extends the run', () => {
    expect(rules([0.5, 0.4, 0.3, 0, 0.5, 0.4, 0.3, 0.5, 0.2])).toEqual([{ rule: 'eight-one-side', start: 0, end: 8 }]);
  });

  it('when six points rise (equal neighbours counted once), then six-trend fires; five do not', () => {
    expect(rules([-1, -0.6, -0.2, 0.2, 0.6]).filter((s) => s.rule === 'six-trend')).toEqual([]);
    expect(rules([-1, -0.6, -0.6, -0.2, 0.2, 0.6, 1]).filter((s) => s.rule === 'six-trend')).toEqual([{ rule: 'six-trend', start: 0, end: 6 }]);
  });

  it('when two of three points are beyond 2 sigma on the same side, then the rule spans those points', () => {
    expect(rules([0, 2.5, 0.1, 2.2, 0])).toEqual([{ rule: 'two-of-three-beyond-2-sigma', start: 1, end: 3 }]);
    // opposite sides do not count together
    expect(rules([0, 2.5, -2.5, 0]).filter((s) => s.rule === 'two-of-three-beyond-2-sigma')).toEqual([]);
  });

  it('when fifteen points in a row are within 1 sigma, then fifteen-within-1-sigma fires; fourteen do not', () => {
    const alternating = (n: number) => Array.from({ length: n }, (_, i) => (i % 2 ? 0.3 : -0.3));
    expect(rules(alternating(14))).toEqual([]);
    expect(rules([2, ...alternating(15), 2])).toEqual([{ rule: 'fifteen-within-1-sigma', start: 1, end: 15 }]);
  });

  it('when sigma is 0 or unknown, then the zone rules that need it stay silent', () => {
    const flat: RulePoint[] = Array.from({ length: 20 }, () => ({ value: 0, centre: 0, sigma: 0, outside: false }));
    expect(specialCauseSignals(flat)).toEqual([]);
    const unknown: RulePoint[] = Array.from({ length: 20 }, (_, i) => ({ value: i % 2 ? 0.1 : -0.1, centre: 0, sigma: null, outside: false }));
    expect(specialCauseSignals(unknown)).toEqual([]);
  });
});
