/**
 * The pure de-identification rules and the default-deny catalog, checked against their
 * published sources: HIPAA Safe Harbor, 45 CFR 164.514(b)(2)(i); limited data sets, 45 CFR
 * 164.514(e); k-anonymity (Sweeney L, Int J Uncertainty Fuzziness Knowledge-Based Systems
 * 2002;10:557-70); CSV injection (OWASP, "CSV Injection").
 */
import { describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import { ageBand, daysFromSurgery, exportAge, neutraliseFormula, perExportCodes, studyIdGenerator, surgeryPeriod } from '../../../shared/exports/deid.js';
import { kAnonymity } from '../../../shared/exports/k-anonymity.js';
import { exportCatalog } from '../../../shared/exports/variables.js';
import { buildDictionary, type DictionaryEntry } from '../../../shared/registry/dictionary.js';
import { csvField } from '../../../server/exports/writers/csv.js';

describe('Safe Harbor (b)(2)(i)(C): ages and dates', () => {
  it('when the age is over 89, then it is the single category "90 or older"; 89 is kept', () => {
    // 45 CFR 164.514(b)(2)(i)(C): "all ages over 89 ... aggregated into a single category of age 90 or older".
    expect(exportAge(89)).toBe(89);
    expect(exportAge(90)).toBe('90 or older');
    expect(exportAge(117)).toBe('90 or older');
    expect(exportAge(0)).toBe(0);
    expect(exportAge(null)).toBeNull();
    expect(ageBand(89, 10)).toBe('80–89');
    expect(ageBand(90, 10)).toBe('90 or older');
    expect(ageBand(85, 20)).toBe('80–89');
    expect(ageBand(41, 20)).toBe('40–59');
  });

  it('when a date is exported, then it is days from surgery (calendar arithmetic, across a leap day and a year end)', () => {
    // 2020 is a leap year (Gregorian calendar): 2020-02-27 to 2020-03-01 is 3 days.
    expect(daysFromSurgery('2020-02-27', '2020-03-01')).toBe(3);
    expect(daysFromSurgery('2020-01-02', '2019-12-30')).toBe(-3);
    expect(daysFromSurgery('2020-01-02', '2020-01-02')).toBe(0);
    expect(daysFromSurgery('2020-01-02', null)).toBeNull();
  });

  it('when the surgery date leaves, then only the year (de-identified) or year-month (limited data set, 45 CFR 164.514(e))', () => {
    expect(surgeryPeriod('2025-03-10', 'deidentified')).toBe('2025');
    expect(surgeryPeriod('2025-03-10', 'limited')).toBe('2025-03');
  });
});

describe('Safe Harbor (b)(2)(i)(B), (R) and (c): codes and study ids', () => {
  it('when study ids are drawn, then they are unique within the export and carry nothing of the case', () => {
    const next = studyIdGenerator((n) => randomBytes(n));
    const ids = Array.from({ length: 20_000 }, next);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids.slice(0, 100)) expect(id).toMatch(/^S-[0-9A-HJKMNP-TV-Z]{10}$/);
    // A generator that repeats itself still yields unique ids (a collision is drawn again).
    let k = 0;
    const stuck = studyIdGenerator((n) => new Uint8Array(n).fill(Math.floor(k++ / 10) % 32));
    expect(stuck()).not.toBe(stuck());
  });

  it('when sites are coded, then each export draws its own order of codes', () => {
    const ids = ['s1', 's2', 's3', 's4'];
    const codes = perExportCodes(ids, 'Site', Math.random);
    expect(new Set(codes.values())).toEqual(new Set(['Site A', 'Site B', 'Site C', 'Site D']));
    const orders = new Set(Array.from({ length: 50 }, () => ids.map((i) => perExportCodes(ids, 'Site', Math.random).get(i)).join()));
    expect(orders.size).toBeGreaterThan(1);
  });
});

describe('formula-like text (OWASP CSV injection)', () => {
  it('when text starts with =, +, -, @, tab or carriage return, then it gets a leading apostrophe; numbers stay bare', () => {
    for (const s of ['=1+1', '+1', '-2+3', '@SUM(A1)', '\t=1', '\r=1']) expect(neutraliseFormula(s)).toBe(`'${s}`);
    expect(neutraliseFormula('Site A')).toBe('Site A');
    expect(csvField(-3)).toBe('-3');
    expect(csvField(12.5)).toBe('12.5');
    expect(csvField('-3')).toBe(`'-3`);
    expect(csvField('a "quote", comma')).toBe('"a ""quote"", comma"');
    expect(csvField(null)).toBe('');
    expect(csvField(true)).toBe('true');
  });
});

describe('k-anonymity (Sweeney 2002)', () => {
  it('when classes are counted, then k is the smallest class, checked against a record-by-record count', () => {
    // Definition (Sweeney 2002): each record matches at least k - 1 others on the quasi-identifiers.
    const records = [
      ...Array.from({ length: 7 }, () => '60|female|A|2019|colorectal'),
      ...Array.from({ length: 3 }, () => '70|male|B|2019|orthopaedic'),
      ...Array.from({ length: 12 }, () => '60|female|B|2019|colorectal'),
    ];
    const bruteK = Math.min(...records.map((r) => records.filter((x) => x === r).length));
    const sizes = [...new Set(records)].map((r) => records.filter((x) => x === r).length);
    expect(kAnonymity(sizes)).toEqual({ records: 22, classes: 3, k: bruteK, classesBelow: 1, recordsBelow: 3, threshold: 5 });
    expect(kAnonymity([])).toMatchObject({ k: 0, records: 0 });
    expect(() => kAnonymity([3, 0])).toThrow(/classSizes\[1\]/);
  });
});

describe('default-deny variable list', () => {
  const dictionary = buildDictionary();
  const names = (d: readonly DictionaryEntry[]) => exportCatalog(d).map((v) => v.name);

  it('when a field is added to the registry without the exportable flag, then it stays out of the export catalog', () => {
    const added: DictionaryEntry = { ...dictionary.find((d) => d.variable === 'sex')!, variable: 'birthCountry', label: 'Country of birth', exportable: false };
    expect(names([...dictionary, added])).not.toContain('birthCountry');
    // Marked exportable by the dictionary it is offered; marked free text it never is.
    expect(names([...dictionary, { ...added, exportable: true }])).toContain('birthCountry');
    expect(names([...dictionary, { ...added, exportable: true, freeText: true }])).not.toContain('birthCountry');
    // A date marked exportable still never leaves as a date.
    expect(names([...dictionary, { ...added, variable: 'operationDate2', type: 'date', exportable: true }])).not.toContain('operationDate2');
  });

  it('when the catalog is built from the registry dictionary, then no free text, raw date, reference or identifier is in it', () => {
    const catalog = exportCatalog(dictionary);
    const offered = new Set(catalog.map((v) => v.name));
    for (const d of dictionary.filter((x) => x.freeText)) expect(offered.has(d.variable), d.variable).toBe(false);
    for (const d of dictionary.filter((x) => x.type === 'date' || x.type === 'reference')) expect(offered.has(d.variable), d.variable).toBe(false);
    for (const banned of ['registryNumber', 'identifierHash', 'localIdentifier', 'siteId', 'unitId', 'id']) expect(offered.has(banned)).toBe(false);
    // Each direct variable is one the dictionary marks exportable.
    for (const v of catalog.filter((x) => x.source.kind === 'case')) expect(dictionary.find((d) => d.variable === v.name)?.exportable, v.name).toBe(true);
    // Every derivation names the Safe Harbor rule it applies.
    for (const v of catalog.filter((x) => x.source.kind === 'derived' && x.name !== 'unit')) expect(v.deidentification, v.name).toMatch(/45 CFR 164\.514/);
  });
});
