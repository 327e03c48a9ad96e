import { describe, expect, it } from 'vitest';
import { AnalysisInputError, blandAltman } from '../../../analysis/index.js';
import { expectClose, PUBLISHED } from '../helpers.js';

describe('blandAltman', () => {
  describe('when checked against Bland JM, Altman DG, Lancet 1986;1:307-10 (peak flow, Wright vs mini Wright, first readings)', () => {
    // The 17 pairs are from memory; the paper reports a mean difference of -2.1 l/min and SD 38.8,
    // which these data reproduce. The paper's limits use 2 SD (-79.7, 75.5); with 1.96 SD they are
    // -2.1 -+ 1.96 x 38.8 = -78.1 and 73.9.
    const wright = [494, 395, 516, 434, 476, 557, 413, 442, 650, 433, 417, 656, 267, 478, 178, 423, 427];
    const mini = [512, 430, 520, 428, 500, 600, 364, 380, 658, 445, 432, 626, 260, 477, 259, 350, 451];
    const r = blandAltman(wright, mini);
    it('then the mean difference is -2.1 and the SD 38.8', () => {
      expect(r.n).toBe(17);
      expectClose(r.meanDifference, -2.1, PUBLISHED(1));
      expectClose(r.sdDifference, 38.8, PUBLISHED(1));
    });
    it('then the limits are mean -+ 1.96 SD: -78.1 and 73.9', () => {
      expectClose(r.lower, -78.1, PUBLISHED(1));
      expectClose(r.upper, 73.9, PUBLISHED(1));
      expectClose(r.lower, r.meanDifference - 1.96 * (r.sdDifference as number), { abs: 1e-12 });
    });
    it('then 2 SD reproduces the paper\'s -79.7 and 75.5 (which it computed from the rounded -2.1 and 38.8)', () => {
      expectClose(r.meanDifference - 2 * (r.sdDifference as number), -79.7, { abs: 0.1 });
      expectClose(r.meanDifference + 2 * (r.sdDifference as number), 75.5, { abs: 0.1 });
    });
  });

  it('when there is a single pair, then the SD and limits are null', () => {
    expect(blandAltman([3], [1])).toEqual({ n: 1, meanDifference: 2, sdDifference: null, lower: null, upper: null });
  });

  it('when the measurements agree exactly, then SD and limits are 0', () => {
    expect(blandAltman([1, 2, 3], [1, 2, 3])).toEqual({ n: 3, meanDifference: 0, sdDifference: 0, lower: 0, upper: 0 });
  });

  it('when the input is invalid, then empty or unequal arrays or a non-finite value throws', () => {
    expect(() => blandAltman([], [])).toThrow(AnalysisInputError);
    expect(() => blandAltman([1, 2], [1])).toThrow(/as many values/);
    expect(() => blandAltman([1, Number.NaN], [1, 2])).toThrow(/a\[1\]/);
  });
});
