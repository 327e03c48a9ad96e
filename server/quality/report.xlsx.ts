/**
 * The agreement report as an Excel workbook (exceljs): per-field agreement, disagreements with
 * their adjudication, and what the figures mean. Every text cell goes through the import
 * engineer's neutraliseText, so nothing that looks like a formula runs when the file is opened.
 */
import ExcelJS from 'exceljs';
import type { AgreementReport } from '../../shared/quality/reabstraction.js';
import { QUALITY_CAUTION } from '../../shared/quality/common.js';
import { neutraliseText } from '../imports/cells.js';

const cell = (v: unknown): string | number | null => (v === null || v === undefined ? null : typeof v === 'number' ? v : neutraliseText(String(v)));

function sheet(wb: ExcelJS.Workbook, name: string, header: string[], rows: unknown[][]) {
  const ws = wb.addWorksheet(name);
  ws.addRow(header).font = { bold: true };
  for (const r of rows) ws.addRow(r.map(cell));
  ws.columns.forEach((c) => { c.width = 18; });
  ws.views = [{ state: 'frozen', ySplit: 1 }];
  return ws;
}

export async function agreementWorkbook(r: AgreementReport): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Alveolog';
  sheet(wb, 'Agreement', ['Field', 'Kind', 'Unit', 'Pairs', 'Agree', 'Percent agreement', 'Kappa', 'po', 'pe', 'Landis & Koch', 'LoA n', 'Mean difference', 'SD of differences', 'Lower limit', 'Upper limit', 'Pairs with a missing value', 'Note'],
    r.fields.map((f) => [f.label, f.kind, f.unit, f.pairs, f.agree, f.percentAgreement, f.kappa, f.observedAgreement, f.expectedAgreement, f.band, f.limits?.n ?? null, f.limits?.meanDifference ?? null, f.limits?.sdDifference ?? null, f.limits?.lower ?? null, f.limits?.upper ?? null, f.pairsWithMissing, f.note]));
  sheet(wb, 'Disagreements', ['Registry number', 'Site', 'Field', 'First abstraction', 'Re-abstraction', 'Decision', 'Reason', 'Adjudicated by', 'Written to the case'],
    r.disagreements.map((d) => [d.registryNumber, d.siteCode, d.label, d.originalText, d.reabstractedText, d.adjudication?.decision ?? 'open', d.adjudication?.reason ?? null, d.adjudication?.byEmail ?? null, d.adjudication ? (d.adjudication.written ? 'yes' : 'no') : null]));
  sheet(wb, 'About', ['Item', 'Value'], [
    ['Sample', r.sample.id],
    ['Seed (mulberry32)', r.sample.seed],
    ['Sites', r.sample.siteCodes.join(', ')],
    ['Cases drawn / pool', `${r.sample.size} / ${r.sample.poolSize}`],
    ['Re-abstracted', r.sample.entered],
    ['Drawn', r.sample.createdAt],
    ['Kappa', "Cohen's kappa (Cohen J, Educ Psychol Meas 1960;20:37-46); 'not documented' counts as a category"],
    ['Agreement words', 'Landis JR, Koch GG, Biometrics 1977;33:159-74: below 0 poor, [0, 0.2] slight, (0.2, 0.4] fair, (0.4, 0.6] moderate, (0.6, 0.8] substantial, (0.8, 1] almost perfect'],
    ['Limits of agreement', 'Bland JM, Altman DG, Lancet 1986;1:307-10: mean difference (first minus second) ± 1.96 SD; dates as differences in days'],
    ['Caution', QUALITY_CAUTION],
  ]);
  return Buffer.from(await wb.xlsx.writeBuffer());
}
