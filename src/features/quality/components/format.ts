/** Number formats for the quality pages (units always written beside numbers). */
export const pct = (x: number | null | undefined, digits = 1) => (x === null || x === undefined ? '—' : `${(x * 100).toFixed(digits)}%`);
export const num = (x: number | null | undefined, digits = 2) => (x === null || x === undefined ? '—' : x.toFixed(digits));
export const count = (n: number) => n.toLocaleString('en-GB');
/** Counts of 1 to 10 are flagged in words (small numbers make shares unstable). */
export const smallNote = (n: number) => (n > 0 && n < 10 ? ' (small number)' : '');
