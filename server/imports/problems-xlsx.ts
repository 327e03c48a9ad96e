/**
 * The dry run's problems as a workbook: a "Problems" list (sheet, row, cell, column, value,
 * message, how to fix) and, per sheet of the upload, the rows with problems laid out in the
 * file's own columns with each offending cell highlighted and its message in the cell's note.
 * Only values already shown in the problems appear (never the identifier, never unmapped
 * columns); text is neutralised so that nothing in the download runs as a formula.
 */
import ExcelJS from 'exceljs';
import type { Problem, SheetInfo } from '../../shared/imports/api.js';
import { neutraliseText } from './cells.js';

const RED = 'FFF4C7C3';
const AMBER = 'FFFCE8C8';
const safe = (v: string | null) => (v === null ? null : neutraliseText(v));
/** A value that is a plain number is written as a number (so -2 stays -2); other text is neutralised. */
const cellValue = (v: string | null) => (v === null ? null : /^-?\d+(\.\d+)?$/.test(v) ? Number(v) : neutraliseText(v));

export async function problemsWorkbook(fileName: string, sheets: readonly SheetInfo[], problems: readonly Problem[], total: number): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Alveolog';
  const list = wb.addWorksheet('Problems', { views: [{ state: 'frozen', ySplit: 1 }] });
  list.columns = [
    { header: 'Sheet', key: 'sheet', width: 18 }, { header: 'Row', key: 'row', width: 7 }, { header: 'Cell', key: 'cell', width: 8 },
    { header: 'Column', key: 'column', width: 28 }, { header: 'Value', key: 'value', width: 24 }, { header: 'Problem', key: 'message', width: 70 },
    { header: 'How to fix', key: 'hint', width: 60 }, { header: 'Severity', key: 'severity', width: 10 },
  ];
  list.getRow(1).font = { bold: true };
  for (const p of problems) {
    const row = list.addRow({ sheet: safe(p.sheet), row: p.row, cell: p.cell, column: safe(p.column), value: cellValue(p.value), message: safe(p.message), hint: safe(p.hint), severity: p.severity });
    row.getCell('severity').fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: p.severity === 'error' ? RED : AMBER } };
  }
  if (total > problems.length) list.addRow({ message: `…and ${total - problems.length} more problems not listed (the first ${problems.length} are kept). Fix these and run the dry run again.` });

  for (const s of sheets) {
    const mine = problems.filter((p) => p.sheet === s.sheet && p.row !== null);
    if (!mine.length) continue;
    const ws = wb.addWorksheet(`${s.sheet.slice(0, 20)} – rows`.slice(0, 31), { views: [{ state: 'frozen', ySplit: 1, xSplit: 1 }] });
    ws.columns = [{ header: 'Row in file', key: '__row', width: 11 }, ...s.headers.map((h, i) => ({ header: neutraliseText(h), key: `c${i}`, width: Math.min(30, Math.max(10, h.length + 2)) }))];
    ws.getRow(1).font = { bold: true };
    const byRow = new Map<number, Problem[]>();
    for (const p of mine) byRow.set(p.row!, [...(byRow.get(p.row!) ?? []), p]);
    for (const [rowNumber, ps] of [...byRow.entries()].sort((a, b) => a[0] - b[0])) {
      const row = ws.addRow({ __row: rowNumber });
      for (const p of ps) {
        const idx = p.column ? s.headers.indexOf(p.column) : -1;
        if (idx < 0) continue;
        const cell = row.getCell(idx + 2);
        if (p.value !== null) cell.value = cellValue(p.value);
        cell.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: p.severity === 'error' ? RED : AMBER } };
        const prev = typeof cell.note === 'string' ? `${cell.note}\n` : '';
        cell.note = `${prev}${p.message} — ${p.hint}`;
      }
    }
  }
  wb.title = `Problems of ${fileName}`;
  return Buffer.from(await wb.xlsx.writeBuffer());
}
