/**
 * CDC/NHSN PNU1 clinically defined pneumonia. Thresholds and rules from the CDC NHSN Patient
 * Safety Component Manual, January 2022 (ch. 6 PNEU, PNU1; ch. 2 for the infection window
 * period, date of event, POA and repeat infection timeframe); TRADE.md marks them checked
 * (secondary copy), none of them memory:
 * - fever > 38.0 °C (> 100.4 °F); WBC ≤ 4,000 or ≥ 12,000 per mm3; altered mental status only
 *   in adults ≥ 70 years; PaO2/FiO2 ≤ 240;
 * - window: the first positive diagnostic test's date ± 3 calendar days, reaching back at most
 *   2 days before admission (NHSN FAQ on POA and RIT);
 * - present on admission when the date of event is hospital day 1 or 2; healthcare-associated
 *   from day 3; an element in the 2 days before admission gives the day of admission as DOE;
 * - repeat infection timeframe 14 days, DOE = day 1.
 * The scenarios are our own.
 */
import { describe, expect, it } from 'vitest';
import { AnalysisInputError } from '../../../analysis/errors.js';
import { pneumoniaNhsnPnu1, withinRepeatInfectionTimeframe, type PneumoniaNhsnInput } from '../../../analysis/clinical/pneumonia-nhsn.js';
import type { Observation } from '../../../shared/clinical/observations.js';
import { observationFactory } from './observation-factory.js';

const ADMISSION = '2024-03-01';
const SURGERY = '2024-03-02';

function run(observations: Observation[], over: Partial<PneumoniaNhsnInput> = {}) {
  return pneumoniaNhsnPnu1({
    observations,
    admissionDate: ADMISSION,
    surgeryDate: SURGERY,
    ageYears: 65,
    underlyingCardiacOrPulmonaryDisease: false,
    ...over,
  });
}
const criterion = (r: ReturnType<typeof run>, id: string) => {
  const c = r.criteria.find((x) => x.id === id);
  if (!c) throw new Error(`no criterion ${id}`);
  return c;
};

describe('pneumoniaNhsnPnu1', () => {
  it('when a definitive image, fever, new cough and rales fall together, then PNU1 is met with its window and date of event', () => {
    const o = observationFactory();
    const r = run([
      o.image('2024-03-05', [{ type: 'consolidation', course: 'new' }], true),
      o.temp('2024-03-05', 38.5),
      o.sign('2024-03-05', 'cough'),
      o.auscultation('2024-03-06', 'rales'),
    ]);
    expect(r.met).toBe(true);
    expect(r.definition).toBe('CDC/NHSN PNU1');
    expect(r.version).toBe('2022');
    expect(r.windowStart).toBe('2024-03-02'); // 5 March - 3 days
    expect(r.windowEnd).toBe('2024-03-08'); // 5 March + 3 days
    expect(r.dateOfEvent).toBe('2024-03-05');
    expect(r.hospitalDayOfEvent).toBe(5);
    expect(r.presentOnAdmission).toBe(false);
    expect(r.healthcareAssociated).toBe(true);
    expect(criterion(r, 'imaging').observationIds).toEqual(['img-1']);
    expect(criterion(r, 'at-least-two-respiratory').met).toBe(true);
  });

  describe('fever > 38.0 °C (NHSN 2022)', () => {
    const withTemp = (value: number, unit: 'degC' | 'degF' = 'degC') => {
      const o = observationFactory();
      return run([
        o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
        o.temp('2024-03-05', value, unit),
        o.sign('2024-03-05', 'dyspnoea'),
        o.auscultation('2024-03-05', 'bronchial-breath-sounds'),
      ]);
    };
    it.each([
      [38.0, 'degC', false],
      [38.1, 'degC', true],
      [100.4, 'degF', false], // 100.4 °F = 38.0 °C exactly (NHSN writes ">100.4 °F")
      [100.6, 'degF', true],
    ] as const)('when the maximum temperature is %s %s, then fever met is %s', (value, unit, met) => {
      const r = withTemp(value, unit);
      expect(criterion(r, 'fever').met).toBe(met);
      expect(r.met).toBe(met);
    });
  });

  describe('WBC ≤ 4,000 or ≥ 12,000 per mm3 (NHSN 2022)', () => {
    it.each([
      [4000, 'per-mm3', true],
      [4001, 'per-mm3', false],
      [11999, 'per-mm3', false],
      [12000, 'per-mm3', true],
      [12, '10^9/L', true], // 12 x10^9/L = 12,000/mm3
      [11.9, '10^9/L', false],
      [4.0, '10^9/L', true],
    ] as const)('when the WBC is %s %s, then the criterion met is %s', (value, unit, met) => {
      const o = observationFactory();
      const r = run([
        o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
        o.wbc('2024-03-05', value, unit),
        o.sign('2024-03-05', 'tachypnoea'),
        o.auscultation('2024-03-05', 'rales'),
      ]);
      expect(criterion(r, 'leukopenia-or-leukocytosis').met).toBe(met);
      expect(r.met).toBe(met);
    });
  });

  describe('altered mental status counts only from age 70 (NHSN 2022)', () => {
    const withAge = (ageYears: number, otherCause = false) => {
      const o = observationFactory();
      return run(
        [
          o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
          o.mental('2024-03-05', true, otherCause),
          o.sign('2024-03-05', 'cough'),
          o.auscultation('2024-03-05', 'rales'),
        ],
        { ageYears },
      );
    };
    it('when the patient is 69, then altered mental status does not count', () => {
      const r = withAge(69);
      expect(criterion(r, 'altered-mental-status').met).toBe(false);
      expect(criterion(r, 'altered-mental-status').reason).toMatch(/70 or over/);
      expect(r.met).toBe(false);
    });
    it('when the patient is 70, then it counts', () => {
      expect(withAge(70).met).toBe(true);
    });
    it('when another cause is recognised, then it does not count', () => {
      expect(criterion(withAge(75, true), 'altered-mental-status').status).toBe('not-met');
    });
  });

  describe('worse gas exchange: PaO2/FiO2 ≤ 240 (NHSN 2022)', () => {
    it.each([
      [240, 'mmHg', true],
      [241, 'mmHg', false],
      [32, 'kPa', true], // 32 kPa = 240.0 mmHg
    ] as const)('when P/F is %s %s as the second respiratory sign, then met is %s', (value, unit, met) => {
      const o = observationFactory();
      const r = run([
        o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
        o.temp('2024-03-05', 38.6),
        o.sign('2024-03-05', 'cough'),
        o.pf('2024-03-05', value, unit),
      ]);
      expect(criterion(r, 'worse-gas-exchange').met).toBe(met);
      expect(r.met).toBe(met);
    });

    it('when oxygen is started, then gas exchange counts as worse', () => {
      const o = observationFactory();
      const r = run([
        o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
        o.temp('2024-03-05', 38.6),
        o.sputum('2024-03-05', { newPurulent: true }),
        o.oxygen('2024-03-05', 'started'),
      ]);
      expect(criterion(r, 'sputum').met).toBe(true);
      expect(criterion(r, 'worse-gas-exchange').met).toBe(true);
      expect(r.met).toBe(true);
    });
  });

  describe('infection window period: first positive image ± 3 days (NHSN 2022 ch. 2)', () => {
    const withFeverOn = (date: string) => {
      const o = observationFactory();
      return run([
        o.image('2024-03-10', [{ type: 'consolidation', course: 'new' }], true),
        o.temp(date, 38.9),
        o.sign('2024-03-10', 'cough'),
        o.auscultation('2024-03-10', 'rales'),
      ]);
    };
    it.each([
      ['2024-03-13', true], // +3 days
      ['2024-03-14', false], // +4 days
      ['2024-03-07', true], // -3 days
      ['2024-03-06', false], // -4 days
    ])('when the fever is on %s for an image on 2024-03-10, then met is %s', (date, met) => {
      const r = withFeverOn(date);
      expect(r.windowStart).toBe('2024-03-07');
      expect(r.windowEnd).toBe('2024-03-13');
      expect(r.met).toBe(met);
      if (!met) expect(criterion(r, 'fever').reason).toMatch(/outside it/);
    });

    it('when the fever is 3 days before the image, then the date of event is the fever date', () => {
      expect(withFeverOn('2024-03-07').dateOfEvent).toBe('2024-03-07');
    });

    it('when the image is on the day of admission, then the window reaches back only 2 days before admission', () => {
      const o = observationFactory();
      const obs = [
        o.image('2024-03-01', [{ type: 'consolidation', course: 'new' }], true),
        o.sign('2024-03-01', 'cough'),
        o.auscultation('2024-03-01', 'rales'),
      ];
      const r3 = run([...obs, o.temp('2024-02-27', 38.9)], { surgeryDate: '2024-03-01' }); // 3 days before admission
      expect(r3.windowStart).toBe('2024-02-28');
      expect(r3.met).toBe(false);
      const r2 = run([...obs, o.temp('2024-02-28', 38.9)], { surgeryDate: '2024-03-01' }); // 2 days before admission
      expect(r2.met).toBe(true);
      // An element before admission gives the day of admission as the date of event (NHSN FAQ).
      expect(r2.dateOfEvent).toBe('2024-03-01');
      expect(r2.hospitalDayOfEvent).toBe(1);
      expect(r2.presentOnAdmission).toBe(true);
    });
  });

  describe('present on admission: hospital day 1 or 2; healthcare-associated from day 3 (NHSN 2022)', () => {
    const allOn = (date: string) => {
      const o = observationFactory();
      return run([
        o.image(date, [{ type: 'infiltrate', course: 'new' }], true),
        o.temp(date, 38.4),
        o.sign(date, 'cough'),
        o.auscultation(date, 'rales'),
      ]);
    };
    it('when the date of event is hospital day 2, then present on admission', () => {
      const r = allOn('2024-03-02');
      expect(r.hospitalDayOfEvent).toBe(2);
      expect(r.presentOnAdmission).toBe(true);
      expect(r.healthcareAssociated).toBe(false);
    });
    it('when the date of event is hospital day 3, then healthcare-associated', () => {
      const r = allOn('2024-03-03');
      expect(r.hospitalDayOfEvent).toBe(3);
      expect(r.presentOnAdmission).toBe(false);
      expect(r.healthcareAssociated).toBe(true);
    });
  });

  describe('imaging criterion', () => {
    const signs = (o: ReturnType<typeof observationFactory>) => [
      o.temp('2024-03-05', 38.4),
      o.sign('2024-03-05', 'cough'),
      o.auscultation('2024-03-05', 'rales'),
    ];

    it('when a patient with underlying disease has new then persistent infiltrate within the window, then met (serial images)', () => {
      const o = observationFactory();
      const r = run(
        [
          o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }]),
          o.image('2024-03-07', [{ type: 'infiltrate', course: 'persistent' }]),
          ...signs(o),
        ],
        { underlyingCardiacOrPulmonaryDisease: true },
      );
      expect(criterion(r, 'imaging').met).toBe(true);
      expect(criterion(r, 'imaging').observationIds).toEqual(['img-1', 'img-2']);
      expect(r.met).toBe(true);
    });

    it('when the persistent image is 4 days after the first, then it is outside the window and not met', () => {
      const o = observationFactory();
      const r = run(
        [
          o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }]),
          o.image('2024-03-09', [{ type: 'infiltrate', course: 'persistent' }]),
          ...signs(o),
        ],
        { underlyingCardiacOrPulmonaryDisease: true },
      );
      expect(criterion(r, 'imaging').met).toBe(false);
    });

    it('when a patient with underlying disease has one definitive image, then not met (needs serial images)', () => {
      const o = observationFactory();
      const r = run([o.image('2024-03-05', [{ type: 'consolidation', course: 'new' }], true), ...signs(o)], {
        underlyingCardiacOrPulmonaryDisease: true,
      });
      expect(criterion(r, 'imaging').status).toBe('not-met');
      expect(criterion(r, 'imaging').reason).toMatch(/underlying/);
      expect(r.met).toBe(false);
      expect(r.dateOfEvent).toBeNull();
    });

    it('when one image is not marked definitive, then not met', () => {
      const o = observationFactory();
      const r = run([o.image('2024-03-05', [{ type: 'consolidation', course: 'new' }], false), ...signs(o)]);
      expect(criterion(r, 'imaging').reason).toMatch(/not marked definitive/);
    });

    it('when imaging shows only an effusion, then the imaging criterion is not met and there is no window', () => {
      const o = observationFactory();
      const r = run([o.image('2024-03-05', [{ type: 'effusion' }], true), ...signs(o)]);
      expect(criterion(r, 'imaging').status).toBe('not-met');
      expect(r.windowStart).toBeNull();
      expect(r.met).toBe(false);
    });

    it('when there is no imaging, then the imaging criterion is missing', () => {
      const o = observationFactory();
      expect(criterion(run(signs(o)), 'imaging').status).toBe('missing');
    });

    it('when the first positive image has no signs around it but a later one does, then the later one sets the window', () => {
      const o = observationFactory();
      const r = run([
        o.image('2024-03-03', [{ type: 'infiltrate', course: 'new' }], true),
        o.image('2024-03-20', [{ type: 'consolidation', course: 'new' }], true),
        o.temp('2024-03-21', 38.7),
        o.sign('2024-03-20', 'cough'),
        o.auscultation('2024-03-20', 'rales'),
      ]);
      expect(r.met).toBe(true);
      expect(r.anchorObservationId).toBe('img-2');
      expect(r.dateOfEvent).toBe('2024-03-20');
    });
  });

  describe('repeat infection timeframe: 14 days, date of event = day 1 (NHSN 2022)', () => {
    const met = (previousPneumoniaDateOfEvent: string) => {
      const o = observationFactory();
      return run(
        [
          o.image('2024-03-05', [{ type: 'infiltrate', course: 'new' }], true),
          o.temp('2024-03-05', 38.4),
          o.sign('2024-03-05', 'cough'),
          o.auscultation('2024-03-05', 'rales'),
        ],
        { previousPneumoniaDateOfEvent },
      );
    };
    it('when the earlier event was on 21 February, then 5 March is day 14 and within the timeframe', () => {
      expect(met('2024-02-21').withinRepeatInfectionTimeframe).toBe(true);
    });
    it('when the earlier event was on 20 February, then 5 March is day 15 and a new event', () => {
      expect(met('2024-02-20').withinRepeatInfectionTimeframe).toBe(false);
    });
    it('when no earlier event is given, then null', () => {
      expect(met(undefined as unknown as string).withinRepeatInfectionTimeframe).toBeNull();
    });
    it.each([
      ['2024-03-01', true], // day 1
      ['2024-03-14', true], // day 14
      ['2024-03-15', false], // day 15
    ])('when the later date of event is %s after one on 2024-03-01, then within is %s', (doe, within) => {
      expect(withinRepeatInfectionTimeframe('2024-03-01', doe)).toBe(within);
    });
  });

  describe('dates from post-operative days, and bad input', () => {
    it('when observations give post-operative days, then they are dated from the surgery date', () => {
      const o = observationFactory();
      const r = run([
        o.image(3, [{ type: 'infiltrate', course: 'new' }], true),
        o.temp(3, 38.4),
        o.sign(3, 'cough'),
        o.auscultation(4, 'rales'),
      ]);
      expect(r.dateOfEvent).toBe('2024-03-05'); // surgery 2 March + 3 days
    });

    it('when an observation has neither date nor post-operative day, then it throws naming it', () => {
      const bad = { id: 'x', kind: 'temperature-max', value: 38.5, unit: 'degC' } as Observation;
      expect(() => run([bad])).toThrow(AnalysisInputError);
      expect(() => run([bad])).toThrow(/observations\[0\]/);
    });

    it('when an observation date and post-operative day disagree, then it throws', () => {
      const bad = { id: 'x', kind: 'temperature-max', value: 38.5, unit: 'degC', date: '2024-03-05', postoperativeDay: 2 } as Observation;
      expect(() => run([bad])).toThrow(/disagrees/);
    });

    it('when two observations share an id, then it throws', () => {
      const a = { id: 'x', kind: 'temperature-max', value: 38.5, unit: 'degC', date: '2024-03-05' } as Observation;
      expect(() => run([a, { ...a }])).toThrow(/used by two/);
    });

    it.each([['ageYears'], ['underlyingCardiacOrPulmonaryDisease'], ['admissionDate'], ['surgeryDate']])(
      'when %s is missing, then it throws naming it',
      (field) => {
        expect(() => run([], { [field]: undefined } as Partial<PneumoniaNhsnInput>)).toThrow(field);
      },
    );

    it('when surgery is before admission, then it throws', () => {
      expect(() => run([], { surgeryDate: '2024-02-28' })).toThrow(/before admissionDate/);
    });
  });
});
