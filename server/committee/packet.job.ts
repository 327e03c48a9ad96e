/**
 * The review packet of a published month, as a background job ('committee-packet'): an
 * exceljs workbook with a summary sheet (signals, findings, actions) and one sheet per enabled
 * measure holding the network's monthly table and its chart as a PNG (SVG drawn by
 * chart-svg.ts, rendered by Debian's headless chromium in chart-png.ts). When it is written,
 * the committee members get an e-mail with the signals summary and a link.
 */
import fs from 'node:fs';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { registerJobKind, JobCancelled } from '../jobs/registry.js';
import type { AppContext } from '../context.js';
import type { ChartResponse } from '../../shared/committee/chart.js';
import { MEASURES } from '../../shared/committee/measures.js';
import { todayIn } from '../../shared/registry/derived.js';
import { getReview } from '../reviews/reviews.service.js';
import { allCharts } from './signals.service.js';
import { chartSvg } from './chart-svg.js';
import { svgsToPngs } from './chart-png.js';
import { monthLabel } from '../measures/months.js';

export const PACKET_JOB = 'committee-packet';

export function packetDir(context: AppContext): string {
  return path.resolve(context.config.DATA_DIR, 'packets');
}

/** The measure sheet's table columns, in order (the test reads them back). */
export const TABLE_HEADER = ['Month', 'Numerator', 'Denominator', 'Value', 'Unit', 'Centre line', 'Lower limit', 'Upper limit', 'Run-chart median', 'Phase', 'Provisional', 'Signals'];

/** Excel sheet names: at most 31 characters, none of : \ / ? * [ ]. */
export function sheetName(short: string, used: Set<string>): string {
  let name = short.replace(/[:\\/?*[\]]/g, ' ').slice(0, 31);
  for (let k = 2; used.has(name); k++) name = `${short.slice(0, 28)} ${k}`;
  used.add(name);
  return name;
}

function measureSheet(wb: ExcelJS.Workbook, chart: ChartResponse, png: Buffer, used: Set<string>) {
  const ws = wb.addWorksheet(sheetName(chart.measure.short, used));
  ws.addRow([chart.measure.label]).font = { bold: true, size: 13 };
  ws.addRow([`${chart.scope.label}; ${chart.measure.chart} and run chart; unit ${chart.measure.unit}; ${chart.summary}`]);
  const signalNo = new Map(chart.signals.map((s, k) => [s.id, k + 1]));
  const header = ws.addRow(TABLE_HEADER);
  header.font = { bold: true };
  for (const p of chart.points) {
    ws.addRow([p.period, p.numerator, p.denominator, p.value, chart.measure.unit, p.centre, p.lower, p.upper, p.median, p.phase + 1, p.provisional ? 'yes' : 'no', p.signals.map((s) => signalNo.get(s)).join(', ')]);
  }
  ws.addRow([]);
  ws.addRow(['Signals']).font = { bold: true };
  if (!chart.signals.length) ws.addRow(['None: the variation looks random (common cause).']);
  chart.signals.forEach((s, k) => ws.addRow([`${k + 1}. ${s.label}`, `${s.startPeriod} to ${s.endPeriod}`, s.explanation]));
  ws.columns.forEach((c, i) => { c.width = i === 0 ? 16 : i === 2 ? 14 : 12; });
  const id = wb.addImage({ buffer: png as unknown as ExcelJS.Buffer, extension: 'png' });
  ws.addImage(id, { tl: { col: TABLE_HEADER.length + 1, row: 2 }, ext: { width: 960, height: 420 } });
}

/** Builds the workbook of a month; returns it with the charts it used. */
export async function buildPacket(context: AppContext, month: string, onProgress: (p: Record<string, number | string>) => Promise<void> = async () => undefined, isCancelled: () => Promise<boolean> = async () => false) {
  const { ds } = context;
  await onProgress({ step: 'computing charts', done: 0, total: MEASURES.length });
  const scopes = await allCharts(ds, month);
  const network = scopes.find((s) => s.site === 'network')!;
  const today = todayIn(context.config.NETWORK_TIME_ZONE, new Date());
  const review = await getReview(ds, month, today);
  if (await isCancelled()) throw new JobCancelled();
  await onProgress({ step: 'drawing chart images', done: 0, total: network.charts.length });
  const pngs = await svgsToPngs(network.charts.map((c) => chartSvg(c)));

  const wb = new ExcelJS.Workbook();
  wb.creator = 'Alveolog';
  wb.created = new Date();
  const summary = wb.addWorksheet('Summary');
  summary.addRow([`Committee review packet — ${monthLabel(month)}`]).font = { bold: true, size: 14 };
  summary.addRow([`Review: ${review.status === 'signed' ? `signed off by ${review.signedBy} on ${review.signedAt?.slice(0, 10)}` : review.status === 'draft' ? 'recorded, not yet signed off' : 'not recorded yet'}`]);
  summary.addRow(['Surveillance and quality improvement only: a signal prompts a search for causes; local protocol and the clinician\'s judgement decide care.']);
  summary.addRow([]);
  summary.addRow(['Signals']).font = { bold: true };
  summary.addRow(['Measure', 'Scope', 'Chart', 'Rule', 'From', 'To', 'Direction', 'Explanation']).font = { bold: true };
  let signalCount = 0;
  for (const scope of scopes) {
    for (const c of scope.charts) {
      for (const s of c.signals) {
        signalCount += 1;
        summary.addRow([c.measure.short, scope.siteCode ?? 'Network', s.chart === 'run' ? 'run chart' : c.measure.chart, s.label, s.startPeriod, s.endPeriod,
          s.favourable === null ? 'no direction' : `${s.direction} (${s.favourable ? 'better' : 'worse'})`, s.explanation]);
      }
    }
  }
  if (!signalCount) summary.addRow(['No signal on any chart.']);
  summary.addRow([]);
  summary.addRow(['Findings']).font = { bold: true };
  summary.addRow(['Measure', 'Signal seen', 'Discussion', 'Recorded by']).font = { bold: true };
  for (const f of review.findings) summary.addRow([MEASURES.find((m) => m.key === f.measureKey)?.short ?? f.measureKey, f.signalSeen ? 'yes' : 'no', f.discussion, f.updatedBy ?? '']);
  if (!review.findings.length) summary.addRow(['None recorded.']);
  summary.addRow([]);
  summary.addRow(['Actions']).font = { bold: true };
  summary.addRow(['Measure', 'Action', 'Owner', 'Due', 'Status']).font = { bold: true };
  for (const a of review.actions) summary.addRow([MEASURES.find((m) => m.key === a.measureKey)?.short ?? a.measureKey, a.description, a.ownerName, a.dueDate, a.overdue ? 'open (overdue)' : a.status]);
  if (!review.actions.length) summary.addRow(['None recorded.']);
  summary.columns.forEach((c, i) => { c.width = [24, 12, 18, 26, 10, 10, 16, 90][i] ?? 14; });

  const used = new Set(['Summary']);
  network.charts.forEach((c, i) => measureSheet(wb, c, pngs[i], used));
  await onProgress({ step: 'writing workbook', done: network.charts.length, total: network.charts.length });
  return { wb, scopes, network, review, signalCount };
}

async function committeeEmails(context: AppContext): Promise<string[]> {
  const rows: { email: string }[] = await context.ds.query(`SELECT email FROM users WHERE active AND 'committee' = ANY(roles) ORDER BY email`);
  return rows.map((r) => r.email);
}

registerJobKind(PACKET_JOB, async (job, tools, context) => {
  const month = String(job.payload.month);
  const baseUrl = String(job.payload.baseUrl ?? context.config.APP_URL ?? '');
  const { wb, network, scopes, signalCount } = await buildPacket(context, month, tools.progress, tools.isCancelled);
  const dir = packetDir(context);
  fs.mkdirSync(dir, { recursive: true });
  // Written to a temporary name and renamed: a half-written packet is never offered.
  const file = path.join(dir, `${job.id}.xlsx`);
  await wb.xlsx.writeFile(`${file}.part`);
  fs.renameSync(`${file}.part`, file);
  const to = await committeeEmails(context);
  const lines = scopes.flatMap((s) => s.charts.flatMap((c) => c.signals.map((x) => `- ${c.measure.short} at ${s.siteCode ?? 'network level'}: ${x.label} (${x.chart === 'run' ? 'run chart' : c.measure.chart}), ${monthLabel(x.startPeriod)} to ${monthLabel(x.endPeriod)}`)));
  if (to.length) {
    await context.mailer.send({
      to,
      subject: `Alveolog: committee review packet for ${monthLabel(month)} is ready`,
      text: [
        `The review of ${monthLabel(month)} is published.`, '',
        `Signals (${signalCount}):`, ...(lines.length ? lines : ['- none']), '',
        `Packet (Excel workbook, one sheet per measure): ${baseUrl}/committee/packet/${month}`,
        `Printable page: ${baseUrl}/committee/packet/${month}/print`, '',
        'Surveillance and quality improvement only; local protocol and the clinician\'s judgement decide care.',
      ].join('\n'),
    });
  }
  await tools.progress({ step: 'done', done: network.charts.length, total: network.charts.length });
  return { month, file: path.basename(file), bytes: fs.statSync(file).size, measures: network.charts.length, signals: signalCount, emailed: to.length };
});
