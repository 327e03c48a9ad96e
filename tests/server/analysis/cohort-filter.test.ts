import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  AGE_BAND_KEYS,
  ADHERENCE_BAND_KEYS,
  CohortFilterSchema,
  decodeCohortFilter,
  encodeCohortFilter,
  type CohortFilter,
} from '../../../shared/analysis/cohort-filter.js';
import { ASA_CLASSES, INCISION_SITES, PROCEDURE_CATEGORIES, PPC_EVENT_TYPES, THERAPY_MODALITIES, CASE_STATUSES, SEXES, APPROACHES, URGENCIES } from '../../../shared/clinical/codes.js';
import { SqlParams, cohortCells, usesOnlyRollupDimensions, wholeMonths } from '../../../server/analysis/cohort-sql.js';
import { CATEGORY_CODES, INCISION_CODES, ASA_CODES, EVENT_TYPE_BITS, MODALITY_BITS, STATUS_CODES, SEX_CODES, APPROACH_CODES, URGENCY_CODES, ANY_PPC_MASK } from '../../../server/analysis/facts.js';
import { ANY_PPC_COMPONENTS } from '../../../analysis/clinical/ppc-composite.js';

const sub = <T>(xs: readonly T[]) => fc.uniqueArray(fc.constantFrom(...xs), { maxLength: xs.length }).map((a) => (a.length ? a : undefined));
const date = fc.date({ min: new Date('2015-01-01'), max: new Date('2030-12-31'), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));
const filterArb: fc.Arbitrary<CohortFilter> = fc.record({
  from: fc.option(date, { nil: undefined }),
  sites: fc.option(fc.uniqueArray(fc.uuid({ version: 4 }), { minLength: 1, maxLength: 3 }), { nil: undefined }),
  procedureCategories: sub(PROCEDURE_CATEGORIES),
  incisionSites: sub(INCISION_SITES),
  asaClasses: sub(ASA_CLASSES),
  ageBands: sub(AGE_BAND_KEYS),
  adherenceBands: sub(ADHERENCE_BAND_KEYS),
  modalities: sub(THERAPY_MODALITIES),
  outcomeTypes: sub(PPC_EVENT_TYPES),
  therapy: fc.option(fc.constantFrom('yes' as const, 'no' as const), { nil: undefined }),
  firstTherapyMin: fc.option(fc.integer({ min: 0, max: 5 }), { nil: undefined }),
}, { requiredKeys: [] }).map((f) => JSON.parse(JSON.stringify(f)) as CohortFilter);

const sorted = (f: CohortFilter) => JSON.parse(JSON.stringify(f, (_k, v) => (Array.isArray(v) ? [...v].sort() : v)));

describe('cohort filter URL encoding', () => {
  it('when any valid filter is encoded and decoded, then the same filter comes back (lists as sets)', () => {
    fc.assert(fc.property(filterArb, (f) => {
      expect(CohortFilterSchema.safeParse(f).success).toBe(true);
      const back = decodeCohortFilter(new URLSearchParams(encodeCohortFilter(f).toString()));
      expect(sorted(back)).toEqual(sorted(f));
    }), { numRuns: 300 });
  });

  it('when a second cohort is namespaced with a prefix, then both decode on their own from one URL', () => {
    const a: CohortFilter = { ariscatClasses: ['high'], therapy: 'yes' };
    const b: CohortFilter = { ariscatClasses: ['high'], therapy: 'no', from: '2024-01-01' };
    const url = new URLSearchParams(`${encodeCohortFilter(a, 'a.')}&${encodeCohortFilter(b, 'b.')}`);
    expect(decodeCohortFilter(url, 'a.')).toEqual(a);
    expect(decodeCohortFilter(url, 'b.')).toEqual(b);
  });

  it('when a status that never counts is asked for, then the filter is refused', () => {
    expect(() => decodeCohortFilter(new URLSearchParams('status=draft'))).toThrow(/never count in analyses/);
  });
});

describe('cohort SQL', () => {
  it('when filter values carry SQL text, then it travels only in the bind parameters', () => {
    const evil = "2024-01-01'; DROP TABLE surgical_cases; --";
    const params = new SqlParams();
    // The schema refuses such a date; cohort SQL must still never inline values it is given.
    const sql = cohortCells({ sites: ["00000000-0000-0000-0000-000000000000' OR '1'='1"], from: evil, sexes: ['female'] } as CohortFilter, { params });
    expect(sql).not.toContain('DROP TABLE');
    expect(sql).not.toContain("'1'='1");
    expect(params.values).toContain(evil);
  });

  it('when only the roll-up dimensions are used, then the roll-up answers; any other field sends the query to the fact table', () => {
    expect(usesOnlyRollupDimensions({ from: '2021-01-01', ariscatClasses: ['high'], incisionSites: ['upper-abdominal'], therapy: 'yes', sites: [] })).toBe(true);
    expect(usesOnlyRollupDimensions({ asaClasses: ['III'] })).toBe(false);
    const params = new SqlParams();
    expect(cohortCells({ from: '2021-01-01', to: '2021-12-31' }, { params })).not.toContain('analysis_case_facts');
    expect(cohortCells({ from: '2021-01-15', to: '2021-12-31' }, { params: new SqlParams() })).toMatch(/analysis_cells.*UNION ALL.*analysis_case_facts/s);
  });

  it('when a date range has partial months at its ends, then only the whole months come from the roll-up', () => {
    expect(wholeMonths('2021-01-01', '2025-12-31')).toEqual({ first: '2021-01-01', last: '2025-12-01' });
    expect(wholeMonths('2021-01-15', '2021-03-30')).toEqual({ first: '2021-02-01', last: '2021-02-01' });
    expect(wholeMonths('2024-02-01', '2024-02-29')).toEqual({ first: '2024-02-01', last: '2024-02-01' });
    expect(wholeMonths(undefined, '2023-02-28')).toEqual({ first: null, last: '2023-02-01' });
  });

  it('when the shared code lists are read, then every value has a frozen analysis code, and the any-PPC mask is the composite', () => {
    const pairs: [readonly string[], readonly string[]][] = [
      [CASE_STATUSES, STATUS_CODES], [PROCEDURE_CATEGORIES, CATEGORY_CODES], [INCISION_SITES, INCISION_CODES], [ASA_CLASSES, ASA_CODES],
      [PPC_EVENT_TYPES, EVENT_TYPE_BITS], [THERAPY_MODALITIES, MODALITY_BITS], [SEXES, SEX_CODES], [APPROACHES, APPROACH_CODES], [URGENCIES, URGENCY_CODES],
    ];
    for (const [shared, frozen] of pairs) for (const v of shared) expect(frozen, `missing analysis code for ${v}`).toContain(v);
    // The composite of Canet 2010 / Jammer 2015 as defined in analysis/clinical/ppc-composite.ts.
    const mask = ANY_PPC_COMPONENTS.reduce((m, t) => m | (1 << EVENT_TYPE_BITS.indexOf(t)), 0);
    expect(ANY_PPC_MASK).toBe(mask);
    expect(mask).toBe(247);
  });
});
