/**
 * xlsx with exceljs's streaming WorkbookWriter (rows are written to the file as they come,
 * never held): README sheet first (written and closed before the data, so the zip stream never
 * waits on it), then Data (continued on "Data 2", ... past the sheet limit), then Dictionary.
 */
import ExcelJS from 'exceljs';
import { XLSX_MAX_ROWS_PER_SHEET } from '../../../shared/exports/schemas.js';
import { neutraliseFormula } from '../../../shared/exports/deid.js';
import type { Cell } from '../transform.js';
import type { FileParts, RowSink } from './types.js';

/** Text cells are neutralised wherever they come from (README values may quote a site name). */
const safe = (cells: readonly (Cell | undefined)[]) => cells.map((c) => (typeof c === 'string' ? neutraliseFormula(c) : c));

/** Rows between two turns of the event loop: zlib's chunks complete only on a turn, so the zip keeps up. */
const YIELD_EVERY = 25; // measured: every 2,000 rows let RSS grow by 400 MB for 200,000 x 60; every 25 keeps it near 120 MB

export function openXlsx(path: string, parts: FileParts, opts: { maxRowsPerSheet?: number } = {}): RowSink {
  // The format's limit counts the header row (Excel specifications and limits: 1,048,576 rows).
  const maxRows = opts.maxRowsPerSheet ?? XLSX_MAX_ROWS_PER_SHEET;
  // Deflate level 1: the sheet XML is large and repetitive; level 6 cost seconds for little size.
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: path, useStyles: false, useSharedStrings: false, zip: { zlib: { level: 1 } } });
  wb.creator = 'Alveolog';
  const readme = wb.addWorksheet('README');
  for (const line of parts.readme) readme.addRow(safe(line)).commit();
  readme.commit();
  let sheets = 0;
  let sheet: ExcelJS.Worksheet;
  let rowsInSheet = 0;
  const newSheet = () => {
    sheets += 1;
    sheet = wb.addWorksheet(sheets === 1 ? 'Data' : `Data ${sheets}`);
    sheet.addRow(parts.header).commit();
    rowsInSheet = 1;
  };
  newSheet();
  let pending = 0;
  return {
    async row(cells: Cell[]) {
      if (rowsInSheet >= maxRows) {
        sheet.commit();
        newSheet();
      }
      sheet.addRow(cells).commit();
      rowsInSheet += 1;
      // The writer has no backpressure of its own: give the zip stream a turn often.
      if (++pending >= YIELD_EVERY) {
        pending = 0;
        await new Promise((r) => setImmediate(r));
      }
    },
    async finish() {
      sheet.commit();
      const dict = wb.addWorksheet('Dictionary');
      dict.addRow([...parts.dictionaryHeader]).commit();
      for (const r of parts.dictionary) dict.addRow(safe(r)).commit();
      dict.commit();
      await wb.commit();
      return { sheets };
    },
    async abort() {
      try {
        sheet.commit();
        await wb.commit();
      } catch {
        // the caller deletes the partial file
      }
    },
  };
}
