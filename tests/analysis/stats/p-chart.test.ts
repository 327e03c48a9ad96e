import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, pChart } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

describe('pChart', () => {
  describe('when checked against Montgomery DC, Introduction to Statistical Quality Control, Example 7.1 (orange-juice cans, 30 samples of 50)', () => {
    // Nonconforming cans per sample (from memory); the book gives p-bar 0.2313, UCL 0.4102,
    // LCL 0.0524 and samples 15 and 23 beyond the upper limit.
    const defectives = [12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12, 7, 13, 9, 6];
    const chart = pChart(defectives.map((events) => ({ events, total: 50 })));
    it('then the centre and limits are 0.2313, 0.0524 and 0.4102', () => {
      expectClose(chart.centre, 0.2313, PUBLISHED(4));
      expectClose(chart.points[0].lower, 0.0524, PUBLISHED(4));
      expectClose(chart.points[0].upper, 0.4102, PUBLISHED(4));
    });
    it('then samples 15 and 23 (indices 14 and 22) are outside', () => {
      expect(chart.points.flatMap((p, i) => (p.outside ? [i] : []))).toEqual([14, 22]);
      expect(chart.signals.filter((s) => s.rule === 'outside-3-sigma').map((s) => s.start)).toEqual([14, 22]);
    });
  });

  describe('when subgroups differ in size (Provost LP, Murray SK, The Health Care Data Guide, 2011: limits p +- 3 sqrt(p(1 - p)/n_i))', () => {
    it('then each subgroup has its own limits, the lower clamped at 0', () => {
      const chart = pChart([
        { events: 2, total: 20 },
        { events: 30, total: 200 },
        { events: 1, total: 5 },
      ]);
      const p = 33 / 225;
      expectClose(chart.centre, p);
      chart.points.forEach((pt, i) => {
        const n = [20, 200, 5][i];
        const half = 3 * Math.sqrt((p * (1 - p)) / n);
        expectClose(pt.lower, Math.max(0, p - half), { abs: 1e-15 });
        expectClose(pt.upper, Math.min(1, p + half), { abs: 1e-15 });
      });
      expect(chart.points[2].lower).toBe(0);
    });

    it('then the centre comes from the baseline subgroups only', () => {
      const chart = pChart(
        [
          { events: 1, total: 10 },
          { events: 3, total: 10 },
          { events: 9, total: 10 },
        ],
        { baseline: 2 },
      );
      expectClose(chart.centre, 0.2);
      expect(chart.points[2].outside).toBe(true);
    });
  });

  describe('when the proportion is degenerate', () => {
    it('then a centre of 0 gives limits 0 to 0 and any later event is outside', () => {
      const chart = pChart(
        [
          { events: 0, total: 10 },
          { events: 0, total: 10 },
          { events: 1, total: 10 },
        ],
        { baseline: 2 },
      );
      expect(chart.centre).toBe(0);
      expect(chart.points.map((p) => [p.lower, p.upper, p.outside])).toEqual([
        [0, 0, false],
        [0, 0, false],
        [0, 0, true],
      ]);
    });
  });

  describe('properties (fast-check)', () => {
    it('then limits never leave [0, 1] and lower <= centre <= upper', () => {
      fc.assert(
        fc.property(
          fc.array(
            fc.integer({ min: 1, max: 500 }).chain((n) => fc.record({ events: fc.integer({ min: 0, max: n }), total: fc.constant(n) })),
            { minLength: 1, maxLength: 40 },
          ),
          (points) => {
            const chart = pChart(points);
            for (const p of chart.points) {
              expect(p.lower >= 0 && p.upper <= 1).toBe(true);
              expect(p.lower <= chart.centre && chart.centre <= p.upper).toBe(true);
              expect(p.outside).toBe(p.value > p.upper || p.value < p.lower);
            }
          },
        ),
      );
    });
  });

  describe('when the input is invalid', () => {
    it('then no subgroup, a total of 0, events above total or a bad baseline throws', () => {
      expect(() => pChart([])).toThrow(AnalysisInputError);
      expect(() => pChart([{ events: 0, total: 0 }])).toThrow(/points\[0\]\.total/);
      expect(() => pChart([{ events: 1, total: 2 }, { events: 3, total: 2 }])).toThrow(/points\[1\]\.events/);
      expect(() => pChart([{ events: 1, total: 2 }], { baseline: 2 })).toThrow(/baseline/);
    });
  });
});
