/**
 * The de-identification rules applied to every research export, as pure functions shared by the
 * server (which applies them to each row) and the client (which explains them). Each names the
 * rule of the HIPAA Safe Harbor method it implements (45 CFR 164.514(b)(2)(i)).
 */

/** Safe Harbor (b)(2)(i)(C): ages over 89 are aggregated into a single category. */
export const AGE_90_OR_OLDER = '90 or older';

/**
 * Age as exported: whole years up to 89, the single category "90 or older" above.
 * Source: 45 CFR 164.514(b)(2)(i)(C) ("all ages over 89 ... aggregated into a single category of age 90 or older").
 * @param age whole years, or null
 * @example exportAge(89) // 89 ; exportAge(90) // '90 or older'
 */
export function exportAge(age: number | null | undefined): number | string | null {
  if (age === null || age === undefined) return null;
  return age > 89 ? AGE_90_OR_OLDER : age;
}

/**
 * Age band of `width` years ("40–49"), with everything from 90 in one band (Safe Harbor) —
 * a quasi-identifier for the k-anonymity check and the coarsened export.
 * @param width 5, 10 or 20 years; bands start at multiples of the width
 * @example ageBand(47, 10) // '40–49' ; ageBand(93, 10) // '90 or older'
 */
export function ageBand(age: number | null | undefined, width = 10): string | null {
  if (age === null || age === undefined) return null;
  if (age >= 90) return AGE_90_OR_OLDER;
  const lo = Math.floor(age / width) * width;
  return `${lo}–${Math.min(lo + width - 1, 89)}`;
}

const DAY_MS = 86_400_000;
const isoDay = (d: string) => Date.parse(`${d.slice(0, 10)}T00:00:00Z`);

/**
 * A date as the number of days after the surgery date (negative before it), so no date element
 * but the year leaves (Safe Harbor (b)(2)(i)(C): all elements of dates except the year).
 * @example daysFromSurgery('2025-03-10', '2025-03-07') // -3
 */
export function daysFromSurgery(surgeryDate: string, date: string | null | undefined): number | null {
  if (!date) return null;
  return Math.round((isoDay(date) - isoDay(surgeryDate)) / DAY_MS);
}

export const ExportLevels = ['deidentified', 'limited'] as const;
export type ExportLevel = (typeof ExportLevels)[number];

/**
 * The surgery date as exported: the year (fully de-identified, Safe Harbor keeps only the year)
 * or year and month (a limited data set under a data-use agreement, 45 CFR 164.514(e), which may
 * keep dates; Alveolog keeps only the month).
 * @example surgeryPeriod('2025-03-10', 'deidentified') // '2025' ; surgeryPeriod('2025-03-10', 'limited') // '2025-03'
 */
export function surgeryPeriod(surgeryDate: string, level: ExportLevel): string {
  return level === 'limited' ? surgeryDate.slice(0, 7) : surgeryDate.slice(0, 4);
}

/**
 * Text a spreadsheet would read as a formula (leading =, +, -, @, tab or carriage return) gets a
 * leading apostrophe, so opening the file runs nothing (OWASP, "CSV Injection"). Numbers are not
 * text and never pass through here, so negative day offsets stay numbers.
 * @example neutraliseFormula('=HYPERLINK("x")') // "'=HYPERLINK(\"x\")"
 */
export function neutraliseFormula(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** Crockford base32 without I, L, O, U: easy to read aloud and copy. */
const ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/**
 * A generator of study ids for one export: random (from the bytes source given, e.g.
 * crypto.randomBytes), never derived from the case, its registry number or its keyed hash, and
 * unique within the export. Safe Harbor (b)(2)(i)(R) forbids "any other unique identifying number"
 * derived from the record; (c) allows a re-identification code not derived from it.
 */
export function studyIdGenerator(randomBytes: (n: number) => Uint8Array, length = 10): () => string {
  const seen = new Set<string>();
  return () => {
    for (;;) {
      const bytes = randomBytes(length);
      let id = '';
      for (let i = 0; i < length; i++) id += ALPHABET[bytes[i] & 31];
      if (!seen.has(id)) {
        seen.add(id);
        return `S-${id}`;
      }
    }
  };
}

/**
 * Per-export codes for sites or units ("Site A", "Site B" ...) in a random order, so a code tells
 * nothing about which hospital it is and differs between exports (Safe Harbor (b)(2)(i)(B):
 * geographic subdivisions smaller than a state; a hospital's name locates its patients).
 * @param keys the ids to code
 * @param shuffle a permutation source (Math.random-like, in [0, 1)); the server passes a crypto one
 */
export function perExportCodes(keys: readonly string[], prefix: string, random: () => number): Map<string, string> {
  const order = [...keys];
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [order[i], order[j]] = [order[j], order[i]];
  }
  const name = (i: number) => (i < 26 ? String.fromCharCode(65 + i) : `${String.fromCharCode(65 + Math.floor(i / 26) - 1)}${String.fromCharCode(65 + (i % 26))}`);
  return new Map(order.map((k, i) => [k, `${prefix} ${name(i)}`]));
}
