/**
 * The one error the analysis module throws for input it cannot compute on.
 *
 * Thrown for invalid input only (negative counts, events above total, a total of 0,
 * non-finite numbers, empty arrays where a value is needed, options out of range).
 * Degenerate but valid input (0 events, events = total, one point) is answered, never thrown.
 * The message says which function, which argument (with its position), what was wrong and
 * how to fix it, so the server can pass it on as a 400 without rewording.
 */
export class AnalysisInputError extends Error {
  override readonly name = 'AnalysisInputError';
  /** The function that refused the input, e.g. `proportionInterval`. */
  readonly fn: string;
  /** The argument path that was wrong, e.g. `points[3].total`. */
  readonly field: string;

  constructor(fn: string, field: string, message: string) {
    super(`${fn}: ${field} ${message}`);
    this.fn = fn;
    this.field = field;
  }
}
