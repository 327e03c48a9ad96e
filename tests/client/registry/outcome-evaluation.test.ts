import { describe, expect, it } from 'vitest';
import { evaluateEvent } from '../../../src/features/cases/outcome-evaluation.js';

const ctx = { surgeryDate: '2026-10-06', admissionDate: '2026-10-05', age: 65, copd: false, heartFailure: false };
// CDC NHSN Patient Safety Component Manual 2022, ch. 6, PNU1 for a patient without underlying
// cardiac or pulmonary disease: one definitive image with a new infiltrate, at least one sign
// (fever > 38.0 °C) and at least two of: new purulent sputum, new cough, rales, worse gas exchange.
const PNU1_EVIDENCE = [
  { id: 'img', kind: 'chest-imaging', date: '2026-10-09', modality: 'radiograph', findings: [{ type: 'infiltrate', course: 'new' }], definitive: true },
  { id: 't', kind: 'temperature-max', date: '2026-10-09', value: 38.6, unit: 'degC' },
  { id: 's', kind: 'sputum', date: '2026-10-09', newPurulent: true, changedCharacter: false, increasedSecretionsOrSuctioning: false },
  { id: 'c', kind: 'respiratory-sign', date: '2026-10-09', sign: 'cough', onset: 'new' },
];

describe('definitions evaluated live on an event', () => {
  it('when the evidence meets PNU1, then the form shows it met with its date of event', () => {
    const { views, invalid } = evaluateEvent('respiratory-infection', PNU1_EVIDENCE, ctx);
    expect(invalid).toBe(0);
    const pnu1 = views.find((v) => v.id === 'nhsn-pnu1')!;
    expect(pnu1.met).toBe(true);
    // Date of event: the first element used to meet the criterion, here all on 9 Oct (NHSN 2022 ch. 2).
    expect(pnu1.summary).toMatch(/date of event 2026-10-09/);
    expect(views.map((v) => v.id)).toEqual(['nhsn-pnu1', 'epco', 'melbourne']);
  });

  it('when the fever is only 38.0 °C, then PNU1 is not met and the criterion says why', () => {
    // NHSN 2022: fever is > 38.0 °C; 38.0 does not count.
    const evidence = PNU1_EVIDENCE.map((o) => (o.id === 't' ? { ...o, value: 38.0 } : o));
    const pnu1 = evaluateEvent('respiratory-infection', evidence, ctx).views.find((v) => v.id === 'nhsn-pnu1')!;
    expect(pnu1.met).toBe(false);
    expect(pnu1.criteria.some((c) => c.status !== 'met' && /38/.test(c.reason))).toBe(true);
  });

  it('when an observation is half typed, then it is left out and counted, not thrown', () => {
    const r = evaluateEvent('respiratory-infection', [...PNU1_EVIDENCE, { id: 'x', kind: 'wbc', date: '2026-10-09' }], ctx);
    expect(r.invalid).toBe(1);
    expect(r.views.find((v) => v.id === 'nhsn-pnu1')!.met).toBe(true);
  });

  it('when the admission date is missing, then PNU1 says what to enter instead of guessing', () => {
    const pnu1 = evaluateEvent('respiratory-infection', PNU1_EVIDENCE, { ...ctx, admissionDate: null }).views.find((v) => v.id === 'nhsn-pnu1')!;
    expect(pnu1.met).toBeNull();
    expect(pnu1.error).toMatch(/admission date/);
  });

  it('when the event is reintubation, then EPCO says it has no component for it (reported separately)', () => {
    // Jammer I et al., Eur J Anaesthesiol 2015;32:88-105: the PPC composite has no reintubation component.
    const epco = evaluateEvent('reintubation', [], ctx).views.find((v) => v.id === 'epco')!;
    expect(epco.met).toBeNull();
    expect(epco.summary).toMatch(/no component/);
  });
});
