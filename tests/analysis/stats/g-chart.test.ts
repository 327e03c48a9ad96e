import { describe, expect, it } from 'vitest';
import { AnalysisInputError, gChart } from '../../../analysis/index.js';
import { expectClose } from '../helpers.js';

// g-chart limits g +- 3 sqrt(g(g + 1)), lower clamped at 0 (Benneyan JC, Health Care Manag Sci
// 2001;4:305-18: the geometric distribution has mean g and variance g(g + 1) when counting from 0).
describe('gChart', () => {
  it('when cases between events are 10, 30, 20, then the centre is 20 and the upper limit 20 + 3 sqrt(420)', () => {
    const chart = gChart([10, 30, 20]);
    expectClose(chart.centre, 20);
    expectClose(chart.points[0].upper, 20 + 3 * Math.sqrt(420));
    expect(chart.points[0].lower).toBe(0);
  });

  it('when the variance formula is checked against the geometric distribution, then g(g + 1) is its variance (sum over k of (k - g)^2 P(k))', () => {
    const g = 7;
    const p = 1 / (g + 1); // P(K = k) = p (1 - p)^k, k = 0, 1, ...
    let variance = 0;
    for (let k = 0; k < 2000; k += 1) variance += (k - g) ** 2 * p * (1 - p) ** k;
    expectClose(variance, g * (g + 1), { rel: 1e-9 });
  });

  it('when a long gap follows a baseline, then it is outside the upper limit (a signal of improvement)', () => {
    const chart = gChart([3, 5, 4, 2, 6, 200], { baseline: 5 });
    expect(chart.points[5].outside).toBe(true);
    expect(chart.signals).toContainEqual({ rule: 'outside-3-sigma', start: 5, end: 5 });
  });

  it('when every gap is 0, then limits are 0 and nothing is outside', () => {
    const chart = gChart([0, 0, 0]);
    expect(chart.points.every((p) => p.lower === 0 && p.upper === 0 && !p.outside)).toBe(true);
  });

  it('when the input is invalid, then it throws AnalysisInputError', () => {
    expect(() => gChart([])).toThrow(AnalysisInputError);
    expect(() => gChart([3, -1])).toThrow(/between\[1\]/);
  });
});
