/**
 * The import template (xlsx, exceljs): a sheet per record kind with the headers the importer
 * maps automatically, each header's definition and unit in its note, drop-down lists for coded
 * values (from a Lists sheet), example rows from the demo scenario, and the data dictionary
 * generated from the shared schemas.
 */
import ExcelJS from 'exceljs';
import { IMPORT_COLUMNS, SHEET_NAMES, DICTIONARY_SHEET, LISTS_SHEET, README_SHEET, RECORD_KINDS, type ImportColumn, type RecordKind } from '../../shared/imports/fields.js';
import { buildDictionary, DICTIONARY_COLUMNS } from '../../shared/registry/dictionary.js';
import { FREE_TEXT_REMINDER } from '../../shared/registry/text.js';
import { CLINICAL_CAUTION } from '../../shared/clinical/checks.js';
import { columnLetter, neutraliseText } from './cells.js';

/** Rows that carry drop-downs and date formats (more rows can be added; the importer reads them all). */
const VALIDATED_ROWS = 2000;

/**
 * Example rows: fictional cases of the demo network (Harbour Row General Hospital, HBR). The
 * hospital identifiers are invented too; real ones never belong in a template.
 */
const EXAMPLES: Record<RecordKind, Record<string, unknown>[]> = {
  cases: [
    { caseKey: 'C1', siteCode: 'HBR', unitCode: 'SURG-A', localIdentifier: 'DEMO-A17', eligible: 'yes', admissionDate: '2026-10-05', age: 67, sex: 'female', heightCm: 162, weightKg: 71.5, asaClass: 'III', asaEmergency: 'no', smokingStatus: 'former', copd: 'yes', obstructiveSleepApnoea: 'no', heartFailure: 'no', preopSpO2: 95, preopHaemoglobin: 11.8, preopHaemoglobinUnit: 'g/dL', respiratoryInfectionLastMonth: 'no', functionalStatus: 'independent', surgeryDate: '2026-10-06', procedureCategory: null, incisionSite: 'upper-abdominal', approach: 'open', urgency: 'elective', anaesthesia: 'general', durationMinutes: 185, therapyGiven: 'yes', complicationsReviewed: 'yes', dischargeDate: '2026-10-14', icuDays: 1, ventilatorDays: 0, readmitted30d: 'no', died30d: 'no', followUpCompletedOn: '2026-11-06' },
    { caseKey: 'C2', siteCode: 'HBR', unitCode: 'ORTHO', localIdentifier: 'DEMO-B42', eligible: 'yes', admissionDate: '2026-10-08', age: 74, sex: 'male', heightCm: 176, weightKg: 88, asaClass: 'II', asaEmergency: 'no', smokingStatus: 'never', copd: 'no', obstructiveSleepApnoea: 'yes', heartFailure: 'no', preopSpO2: 97, preopHaemoglobin: 132, preopHaemoglobinUnit: 'g/L', respiratoryInfectionLastMonth: 'no', functionalStatus: 'independent', surgeryDate: '2026-10-08', incisionSite: 'peripheral', approach: 'open', urgency: 'emergency', anaesthesia: 'regional', durationMinutes: 95, therapyGiven: 'yes', complicationsReviewed: 'yes', dischargeDate: '2026-10-12', icuDays: 0, ventilatorDays: 0, readmitted30d: 'no', died30d: 'no' },
  ],
  therapy: [
    { caseKey: 'C1', modality: 'incentive-spirometry', startPostoperativeDay: 0, endPostoperativeDay: 5, prescribedSessionsPerDay: 10, sessionsPrescribed: 60, sessionsDelivered: 48, interface: 'mouthpiece', noseClip: 'no', tolerance: 'good', adverseEvents: 'none', stopReason: 'discharged' },
    { caseKey: 'C2', modality: 'early-mobilisation', startPostoperativeDay: 1, endPostoperativeDay: 3, prescribedSessionsPerDay: 3, sessionsPrescribed: 9, sessionsDelivered: 8, tolerance: 'fair', adverseEvents: 'none', stopReason: 'discharged' },
  ],
  outcomes: [
    { caseKey: 'C1', type: 'atelectasis', onsetPostoperativeDay: 2, clavienDindo: 'II', clavienDindoDisability: 'no' },
  ],
};

function noteText(c: ImportColumn): string {
  return [c.label + (c.unit ? ` (${c.unit})` : ''), c.required ? 'Required on every row.' : '', c.note, c.cell.type === 'text' && !c.importOnly ? FREE_TEXT_REMINDER : ''].filter(Boolean).join('\n');
}

/** Example values that fit the column (a code list that lacks the example falls back to its first code). */
function exampleValue(c: ImportColumn, v: unknown): unknown {
  if (v === undefined || v === null) {
    if (c.key === 'procedureCategory' && c.cell.type === 'code') return c.cell.codes[0];
    return null;
  }
  if (c.cell.type === 'code' && !c.cell.codes.includes(String(v))) return c.cell.codes[0];
  if (c.cell.type === 'codes') return String(v).split(';').filter((x) => (c.cell as { codes: readonly string[] }).codes.includes(x)).join(';') || null;
  if (c.cell.type === 'date' && typeof v === 'string') return new Date(`${v}T00:00:00Z`);
  return typeof v === 'string' ? neutraliseText(v) : v;
}

export async function buildTemplate(): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Alveolog';
  wb.created = new Date(Date.UTC(2026, 0, 1));

  const readme = wb.addWorksheet(README_SHEET);
  readme.getColumn(1).width = 110;
  [
    'Alveolog import template',
    '',
    `One sheet per record kind: "${SHEET_NAMES.cases}", "${SHEET_NAMES.therapy}", "${SHEET_NAMES.outcomes}". Keep the header row; point at a header to read its definition and unit.`,
    'Therapy and outcome rows name their case by the "Case key (this file only)" of a case row in this file, or by the registry case number of a case already in Alveolog.',
    'A case row with a registry case number updates that case (or is skipped, as you choose when committing); without one it becomes a new case.',
    'Dates: YYYY-MM-DD or spreadsheet dates. Numbers: digits with the decimal separator you declare when uploading. Yes/no fields: yes or no.',
    'The hospital identifier column is used only to detect duplicates: Alveolog keeps a keyed hash of it and never stores, logs or shows the identifier.',
    'Other columns of a hospital export (names, record numbers, addresses) are dropped while reading if you do not map them; never map them to a registry field.',
    FREE_TEXT_REMINDER,
    `Therapy settings are recorded for surveillance and quality improvement only. ${CLINICAL_CAUTION}`,
    'The example rows are fictional (the demo network); replace them with your own rows.',
  ].forEach((t, i) => { const cell = readme.getCell(i + 1, 1); cell.value = t; if (i === 0) cell.font = { bold: true, size: 14 }; });

  const lists = wb.addWorksheet(LISTS_SHEET);
  const listRanges = new Map<string, string>();
  let listCol = 1;
  const listFor = (name: string, values: readonly string[]) => {
    if (listRanges.has(name)) return listRanges.get(name)!;
    const letter = columnLetter(listCol++);
    lists.getCell(`${letter}1`).value = name;
    lists.getCell(`${letter}1`).font = { bold: true };
    values.forEach((v, i) => { lists.getCell(`${letter}${i + 2}`).value = v; });
    const ref = `'${LISTS_SHEET}'!$${letter}$2:$${letter}$${values.length + 1}`;
    listRanges.set(name, ref);
    return ref;
  };

  for (const kind of RECORD_KINDS) {
    const ws = wb.addWorksheet(SHEET_NAMES[kind], { views: [{ state: 'frozen', ySplit: 1 }] });
    const cols = IMPORT_COLUMNS[kind];
    ws.columns = cols.map((c) => ({ header: c.label, key: c.key, width: Math.min(40, Math.max(12, c.label.length + 2)) }));
    const header = ws.getRow(1);
    header.font = { bold: true };
    cols.forEach((c, i) => {
      const cell = header.getCell(i + 1);
      cell.note = noteText(c);
      if (c.required) cell.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFFCE8C8' } };
    });
    for (const ex of EXAMPLES[kind]) ws.addRow(cols.map((c) => exampleValue(c, ex[c.key])));
    cols.forEach((c, i) => {
      const letter = columnLetter(i + 1);
      const range = `${letter}2:${letter}${VALIDATED_ROWS}`;
      const dv = (ws as unknown as { dataValidations: { add(range: string, v: ExcelJS.DataValidation): void } }).dataValidations;
      if (c.cell.type === 'code') {
        dv.add(range, { type: 'list', allowBlank: true, formulae: [listFor(c.key, c.cell.codes)], showErrorMessage: true, errorTitle: c.label, error: `Choose one of the listed values (${LISTS_SHEET} sheet).` });
      } else if (c.cell.type === 'boolean') {
        dv.add(range, { type: 'list', allowBlank: true, formulae: ['"yes,no"'], showErrorMessage: true, errorTitle: c.label, error: 'Answer yes or no.' });
      } else if (c.cell.type === 'date') {
        ws.getColumn(i + 1).numFmt = 'yyyy-mm-dd';
      } else if (c.cell.type === 'codes') {
        // Several codes per cell: no drop-down (it allows one); the Lists sheet shows the codes.
        listFor(c.key, c.cell.codes);
      }
    });
  }

  const dict = wb.addWorksheet(DICTIONARY_SHEET, { views: [{ state: 'frozen', ySplit: 1 }] });
  dict.columns = DICTIONARY_COLUMNS.map((c) => ({ header: c, key: c, width: c === 'definition' || c === 'allowedValues' ? 60 : 18 }));
  dict.getRow(1).font = { bold: true };
  for (const e of buildDictionary()) dict.addRow(DICTIONARY_COLUMNS.map((c) => { const v = e[c]; return typeof v === 'string' ? neutraliseText(v) : v; }));

  return Buffer.from(await wb.xlsx.writeBuffer());
}
