import type { Cell } from '../transform.js';

/** Where generated rows go: a streaming xlsx workbook or a zipped CSV. */
export interface RowSink {
  /** Appends one data row (awaits when the output needs to drain). */
  row(cells: Cell[]): Promise<void>;
  /** Writes the remaining parts and closes the file. */
  finish(): Promise<{ sheets: number }>;
  /** Stops and leaves the partial file for the caller to delete. */
  abort(): Promise<void>;
}

export interface FileParts {
  header: string[];
  dictionaryHeader: readonly string[];
  dictionary: string[][];
  readme: [string, string][];
}
