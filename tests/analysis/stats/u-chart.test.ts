import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, uChart } from '../../../analysis/index.js';
import { expectClose } from '../helpers.js';

// Limits u +- 3 sqrt(u / n_i) with subgroup size n_i = exposure / per (Provost LP, Murray SK,
// The Health Care Data Guide, 2011; Montgomery DC, Introduction to Statistical Quality Control, sec. 7.3).
describe('uChart', () => {
  it('when exposure differs by month, then each month has limits u +- 3 sqrt(u / (exposure / 1000)) per 1,000', () => {
    const points = [
      { events: 3, exposure: 1200 },
      { events: 1, exposure: 800 },
      { events: 6, exposure: 2000 },
    ];
    const chart = uChart(points);
    const u = (10 / 4000) * 1000;
    expectClose(chart.centre, u);
    chart.points.forEach((p, i) => {
      const n = points[i].exposure / 1000;
      expectClose(p.value, (points[i].events / points[i].exposure) * 1000);
      expectClose(p.upper, u + 3 * Math.sqrt(u / n));
      expectClose(p.lower, Math.max(0, u - 3 * Math.sqrt(u / n)), { abs: 1e-15 });
    });
  });

  it('when per is 100, then the values and limits are scaled consistently (rate per 100 = rate per 1,000 / 10)', () => {
    const points = [
      { events: 30, exposure: 1000 },
      { events: 50, exposure: 1000 },
      { events: 45, exposure: 900 },
    ];
    const a = uChart(points, { per: 1000 });
    const b = uChart(points, { per: 100 });
    expectClose(b.centre, a.centre / 10);
    b.points.forEach((p, i) => {
      expectClose(p.upper, a.points[i].upper / 10);
      expectClose(p.lower, a.points[i].lower / 10, { abs: 1e-15 });
    });
  });

  it('when the baseline has no events, then the centre and limits are 0 and any later event is outside', () => {
    const chart = uChart([{ events: 0, exposure: 500 }, { events: 2, exposure: 500 }], { baseline: 1 });
    expect(chart.centre).toBe(0);
    expect(chart.points[1].outside).toBe(true);
  });

  it('properties: lower >= 0 and lower <= centre <= upper', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ events: fc.integer({ min: 0, max: 50 }), exposure: fc.double({ min: 1, max: 1e5, noNaN: true }) }), {
          minLength: 1,
          maxLength: 30,
        }),
        (points) => {
          const chart = uChart(points);
          for (const p of chart.points) expect(p.lower >= 0 && p.lower <= chart.centre && chart.centre <= p.upper).toBe(true);
        },
      ),
    );
  });

  it('when the input is invalid, then it throws AnalysisInputError', () => {
    expect(() => uChart([])).toThrow(AnalysisInputError);
    expect(() => uChart([{ events: 1, exposure: 0 }])).toThrow(/exposure/);
    expect(() => uChart([{ events: -1, exposure: 10 }])).toThrow(/events/);
    expect(() => uChart([{ events: 1, exposure: 10 }], { per: -5 })).toThrow(/per/);
  });
});
