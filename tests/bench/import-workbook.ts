/**
 * Writes the benchmark's import workbook (streaming WorkbookWriter) in its own process, so the
 * writer's memory is not counted in the server's peak RSS: node --import tsx tests/bench/import-workbook.ts FILE CASES
 */
import ExcelJS from 'exceljs';
import { pathToFileURL } from 'node:url';
import { CASE_COLUMNS } from '../../shared/imports/fields.js';

export async function writeWorkbook(file: string, cases: number): Promise<void> {
  const cols = CASE_COLUMNS.filter((c) => c.key !== 'registryNumber');
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: file, useSharedStrings: true, useStyles: true });
  const ws = wb.addWorksheet('Cases');
  ws.addRow(cols.map((c) => c.label)).commit();
  // Day 0 of each case cycles over 600 days from 2025-01-01; its other dates follow it.
  const day = (i: number, offset: number) => new Date(Date.UTC(2025, 0, 1) + ((i % 600) + offset) * 86_400_000);
  for (let i = 0; i < cases; i++) {
    const v: Record<string, unknown> = {
      caseKey: `B${i}`, siteCode: i % 2 ? 'HBR' : 'KSV', unitCode: ['SURG-A', 'SURG-B', 'ORTHO', 'ICU'][i % 4], localIdentifier: `BENCH-${i}`,
      eligible: 'yes', admissionDate: day(i, 0), surgeryDate: day(i, 1), age: 18 + (i % 80), sex: i % 2 ? 'female' : 'male', heightCm: 150 + (i % 40), weightKg: 50 + (i % 60) + 0.5,
      asaClass: ['I', 'II', 'III', 'IV'][i % 4], asaEmergency: 'no', smokingStatus: ['never', 'former', 'current'][i % 3], copd: i % 7 === 0 ? 'yes' : 'no', obstructiveSleepApnoea: 'no', heartFailure: 'no',
      preopSpO2: 90 + (i % 10), preopHaemoglobin: 10 + (i % 50) / 10, preopHaemoglobinUnit: 'g/dL', respiratoryInfectionLastMonth: 'no', functionalStatus: 'independent',
      incisionSite: 'peripheral', approach: 'open', urgency: 'elective', anaesthesia: 'general', durationMinutes: 30 + (i % 300), therapyGiven: 'yes', complicationsReviewed: 'yes',
      dischargeDate: day(i, 6), icuDays: i % 3, ventilatorDays: 0, readmitted30d: 'no', died30d: 'no',
    };
    ws.addRow(cols.map((c) => {
      if (c.key === 'procedureCategory' && c.cell.type === 'code') return c.cell.codes[i % c.cell.codes.length];
      return v[c.key] ?? null;
    })).commit();
  }
  ws.commit();
  await wb.commit();
}


if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await writeWorkbook(process.argv[2], Number(process.argv[3]));
}
