import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, compareProportions, mantelHaenszelRiskRatio, type Count } from '../../../analysis/index.js';
import { expectClose, expectInterval } from '../helpers.js';

const countArb = fc.integer({ min: 1, max: 200 }).chain((n) => fc.record({ events: fc.integer({ min: 0, max: n }), total: fc.constant(n) }));
const strataArb = fc.array(fc.record({ a: countArb, b: countArb }), { minLength: 1, maxLength: 6 });

/** Greenland S, Robins JM, Biometrics 1985;41:55-68, eq. for the variance of ln RR_MH, written out here with @stdlib's z. */
function reference(strata: { a: Count; b: Count }[], level = 0.95) {
  let r = 0;
  let s = 0;
  let v = 0;
  for (const { a, b } of strata) {
    const n = a.total + b.total;
    r += (a.events * b.total) / n;
    s += (b.events * a.total) / n;
    v += (a.total * b.total * (a.events + b.events) - a.events * b.events * n) / n ** 2;
  }
  const rr = r / s;
  const se = Math.sqrt(v / (r * s));
  const z = normalQuantile(1 - (1 - level) / 2, 0, 1);
  return { estimate: rr, lower: Math.exp(Math.log(rr) - z * se), upper: Math.exp(Math.log(rr) + z * se) };
}

describe('mantelHaenszelRiskRatio', () => {
  it('when there is one stratum without zero cells, then it equals the Katz interval of the crude risk ratio (the Greenland-Robins variance reduces to 1/a - 1/n1 + 1/b - 1/n0)', () => {
    const a = { events: 10, total: 100 };
    const b = { events: 5, total: 100 };
    const crude = compareProportions(a, b).riskRatio;
    expectInterval(mantelHaenszelRiskRatio([{ a, b }]), crude);
  });

  it('when compared with the Greenland-Robins formulas written out independently, then estimate and limits agree', () => {
    fc.assert(
      fc.property(strataArb, fc.double({ min: 0.5, max: 0.999, noNaN: true }), (strata, level) => {
        const ref = reference(strata, level);
        fc.pre(Number.isFinite(ref.estimate) && ref.estimate > 0);
        expectInterval(mantelHaenszelRiskRatio(strata, { level }), ref, { rel: 1e-9, abs: 1e-12 });
      }),
      { numRuns: 300 },
    );
  });

  it('when every stratum has the same risk ratio, then the pooled estimate is that ratio (Mantel & Haenszel 1959)', () => {
    const strata = [
      { a: { events: 4, total: 40 }, b: { events: 2, total: 40 } },
      { a: { events: 30, total: 100 }, b: { events: 15, total: 100 } },
      { a: { events: 12, total: 30 }, b: { events: 12, total: 60 } },
    ];
    expectClose(mantelHaenszelRiskRatio(strata).estimate, 2, { rel: 1e-12 });
  });

  it('properties: swapping A and B inverts the estimate and the limits', () => {
    fc.assert(
      fc.property(strataArb, (strata) => {
        const ab = mantelHaenszelRiskRatio(strata);
        const ba = mantelHaenszelRiskRatio(strata.map(({ a, b }) => ({ a: b, b: a })));
        fc.pre(ab.estimate !== null && ab.estimate > 0 && ba.estimate !== null);
        expectClose(ba.estimate, 1 / ab.estimate!, { rel: 1e-9 });
        expectClose(ba.lower, 1 / ab.upper!, { rel: 1e-9 });
        expectClose(ba.upper, 1 / ab.lower!, { rel: 1e-9 });
      }),
    );
  });

  it('when a group has no events, then the undefined parts are null, never NaN', () => {
    const none = { events: 0, total: 10 };
    const some = { events: 3, total: 10 };
    expect(mantelHaenszelRiskRatio([{ a: none, b: none }])).toEqual({ estimate: null, lower: null, upper: null });
    expect(mantelHaenszelRiskRatio([{ a: none, b: some }])).toEqual({ estimate: 0, lower: 0, upper: null });
    expect(mantelHaenszelRiskRatio([{ a: some, b: none }])).toEqual({ estimate: null, lower: null, upper: null });
  });

  it('when the input is invalid, then it throws AnalysisInputError naming the stratum', () => {
    expect(() => mantelHaenszelRiskRatio([])).toThrow(AnalysisInputError);
    expect(() => mantelHaenszelRiskRatio([{ a: { events: 1, total: 0 }, b: { events: 1, total: 5 } }])).toThrow(/strata\[0\]\.a\.total/);
    expect(() => mantelHaenszelRiskRatio([{ a: { events: 1, total: 5 } } as never])).toThrow(/strata\[0\]\.b/);
  });
});
