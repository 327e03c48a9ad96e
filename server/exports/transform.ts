/**
 * Applies the de-identification rules (shared/exports/deid.ts) to one raw row of the export
 * query. Text is neutralised against formulas; numbers and yes/no stay typed.
 */
import { CLAVIEN_DINDO_GRADES } from '../../shared/clinical/codes.js';
import { ageBand, exportAge, neutraliseFormula, surgeryPeriod } from '../../shared/exports/deid.js';
import type { ExportVariable } from '../../shared/exports/variables.js';
import { AGE_BAND_YEARS } from './query.js';

export type Cell = string | number | boolean | null;

export interface TransformContext {
  level: 'deidentified' | 'limited';
  coarsen: boolean;
  /** site id -> per-export code (or the site's name when approved with names). */
  siteLabel: Map<string, string>;
  /** unit id -> per-export code. */
  unitCode: Map<string, string>;
  nextStudyId: () => string;
}

/** Builds the per-row function for an ordered list of variables (query columns v0..vN, as an array row). */
export function rowTransformer(variables: readonly ExportVariable[], t: TransformContext): (raw: readonly unknown[]) => Cell[] {
  const band = t.coarsen ? AGE_BAND_YEARS.coarse : AGE_BAND_YEARS.normal;
  const fns = variables.map((v): ((x: unknown) => Cell) => {
    const s = v.source;
    if (s.kind === 'derived') {
      switch (s.rule) {
        case 'site': return (x) => { const l = x == null ? undefined : t.siteLabel.get(String(x)); return l === undefined ? null : neutraliseFormula(l); };
        case 'unit': return (x) => (x == null ? null : t.unitCode.get(String(x)) ?? null);
        case 'surgeryPeriod': return (x) => (x == null ? null : surgeryPeriod(`${x}-01`, t.coarsen ? 'deidentified' : t.level));
        // Coarsened: the age leaves as a 20-year band, never in years.
        case 'age': return t.coarsen ? (x) => ageBand(x as number | null, band) : (x) => exportAge(x as number | null);
        case 'ageBand': return (x) => ageBand(x as number | null, band);
        case 'daysFromSurgery': return (x) => (x == null ? null : Number(x));
      }
    }
    if (s.kind === 'ppcWorstGrade') return (x) => (x == null ? null : CLAVIEN_DINDO_GRADES[Number(x) - 1] ?? null);
    return (x) => {
      if (x === null || x === undefined) return null;
      if (typeof x === 'number' || typeof x === 'boolean') return x;
      if (typeof x === 'string') return neutraliseFormula(x);
      return neutraliseFormula(String(x));
    };
  });
  const n = fns.length;
  return (raw) => {
    const out: Cell[] = new Array(n + 1);
    out[0] = t.nextStudyId();
    for (let i = 0; i < n; i++) out[i + 1] = fns[i](raw[i]);
    return out;
  };
}
