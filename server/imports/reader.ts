/**
 * Streams the rows of an uploaded CSV (csv-parse, UTF-8 with or without BOM) or XLSX (exceljs's
 * streaming WorkbookReader, so a large workbook is never held in memory whole). Each row comes
 * as its 1-based spreadsheet row number and a 0-based array of raw cell values.
 */
import fs from 'node:fs';
import { parse as csvParse } from 'csv-parse';
import ExcelJS from 'exceljs';
import { AppError } from '../http/errors.js';

export interface RawRow { number: number; values: unknown[] }
export interface RawSheet { name: string; rows: AsyncIterable<RawRow> }

export const corruptXlsx = (detail?: string) =>
  new AppError(400, 'corrupt_file', 'the workbook could not be read: it is damaged or not a real .xlsx file', {
    hint: 'open it in your spreadsheet program, save it again as "Excel Workbook (.xlsx)" and upload that copy',
    details: detail ? { reason: detail.slice(0, 200) } : undefined,
  });

async function* csvRows(filePath: string): AsyncGenerator<RawRow> {
  const parser = fs.createReadStream(filePath).pipe(csvParse({ bom: true, relax_column_count: true, relax_quotes: false, skip_empty_lines: false, info: true }));
  try {
    for await (const rec of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      yield { number: rec.info.lines, values: rec.record };
    }
  } catch (err) {
    const e = err as { code?: string; message?: string; lines?: number };
    throw new AppError(400, 'malformed_csv', `the CSV file could not be read near line ${e.lines ?? '?'}: ${String(e.message ?? '').replace(/\s+/g, ' ').slice(0, 160)}`, {
      hint: 'check that quoted cells are closed ("...") and that the file is saved as CSV UTF-8 with commas between cells',
    });
  }
}

/** The CSV as one sheet (its record kind is declared with the upload). */
export function csvSheet(filePath: string, name: string): RawSheet {
  return { name, rows: csvRows(filePath) };
}

/**
 * The sheets of an XLSX file in order, each with its rows. Rows of one sheet must be consumed
 * before the next sheet is read (it is one pass over the zip).
 */
export async function* xlsxSheets(filePath: string): AsyncGenerator<RawSheet> {
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(filePath, { worksheets: 'emit', sharedStrings: 'cache', styles: 'ignore', hyperlinks: 'ignore', entries: 'ignore' });
  try {
    for await (const ws of reader as unknown as AsyncIterable<AsyncIterable<{ number: number; values: unknown[] }> & { name?: string; id?: number }>) {
      const name = ws.name ?? `Sheet${ws.id ?? ''}`;
      const rows = (async function* () {
        try {
          for await (const row of ws) {
            const v = Array.isArray(row.values) ? row.values.slice(1) : [];
            yield { number: row.number, values: v };
          }
        } catch (err) {
          throw err instanceof AppError ? err : corruptXlsx((err as Error).message);
        }
      })();
      yield { name, rows };
    }
  } catch (err) {
    throw err instanceof AppError ? err : corruptXlsx((err as Error).message);
  }
}

export const isEmptyRow = (values: readonly unknown[]) => values.every((v) => v === null || v === undefined || (typeof v === 'string' && v.trim() === ''));
