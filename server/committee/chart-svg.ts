/**
 * Draws a measure's chart as a standalone SVG for the review packet: the monthly values, the
 * control chart's centre line and per-month limits, the run chart's median, phases, annotations,
 * provisional months (hollow points) and signals (a distinct shape and a number, explained in the
 * sheet's table and the summary), in Okabe & Ito's colour-blind-safe palette. Pure string output;
 * chart-png.ts turns it into a PNG with headless chromium.
 */
import type { ChartResponse } from '../../shared/committee/chart.js';
import { monthLabel } from '../measures/months.js';

// Okabe M, Ito K, Color Universal Design (2002): the palette of the app's chart-1..8 tokens.
const OI = { blue: '#0072b2', orange: '#e69f00', green: '#009e73', pink: '#cc79a7', sky: '#56b4e9', vermillion: '#d55e00', yellow: '#f0e442', black: '#000000' };

const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);
const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

export function chartSvg(chart: ChartResponse, opts: { width?: number; height?: number } = {}): string {
  const W = opts.width ?? 960;
  const H = opts.height ?? 420;
  const pad = { l: 64, r: 24, t: 48, b: 92 };
  const pts = chart.points;
  const n = Math.max(pts.length, 1);
  const vals = pts.flatMap((p) => [p.value, p.upper, p.lower, p.median, p.centre]).filter((v): v is number => v !== null && Number.isFinite(v));
  let lo = Math.min(0, ...vals);
  let hi = Math.max(...vals, 1e-9);
  if (chart.measure.kind === 'individuals') lo = Math.min(...vals, hi) - (hi - Math.min(...vals, hi)) * 0.1;
  hi = hi + (hi - lo) * 0.08;
  if (hi === lo) hi = lo + 1;
  const x = (i: number) => pad.l + ((W - pad.l - pad.r) * (i + 0.5)) / n;
  const y = (v: number) => pad.t + (H - pad.t - pad.b) * (1 - (v - lo) / (hi - lo));
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="Noto Sans, DejaVu Sans, sans-serif" font-size="12">`);
  out.push(`<rect width="${W}" height="${H}" fill="#ffffff"/>`);
  out.push(`<text x="${pad.l}" y="20" font-size="15" font-weight="bold" fill="#1f2a2e">${esc(clip(`${chart.measure.label} — ${chart.scope.label}`, Math.floor((W - pad.l) / 8.5)))}</text>`);
  out.push(`<text x="${pad.l}" y="38" fill="#56636a">${esc(`${chart.measure.chart} with run-chart median; unit: ${chart.measure.unit}; hollow points are provisional (month not closed)`)}</text>`);
  // Axes and gridlines
  const ticks = 5;
  for (let k = 0; k <= ticks; k++) {
    const v = lo + ((hi - lo) * k) / ticks;
    out.push(`<line x1="${pad.l}" x2="${W - pad.r}" y1="${y(v)}" y2="${y(v)}" stroke="#e6e1d6"/>`);
    out.push(`<text x="${pad.l - 6}" y="${y(v) + 4}" text-anchor="end" fill="#1f2a2e">${v.toFixed(chart.measure.unit === '%' || chart.measure.unit === 'days' ? 1 : 2)}</text>`);
  }
  out.push(`<text transform="translate(14 ${(pad.t + H - pad.b) / 2}) rotate(-90)" text-anchor="middle" fill="#1f2a2e">${esc(chart.measure.unit)}</text>`);
  const every = Math.max(1, Math.ceil(n / 20));
  pts.forEach((p, i) => {
    if (i % every === 0) out.push(`<text transform="translate(${x(i)} ${H - pad.b + 14}) rotate(45)" fill="#1f2a2e">${esc(monthLabel(p.period))}</text>`);
  });
  // Phase boundaries and annotations
  for (const ph of chart.phases.slice(1)) {
    const i = pts.findIndex((p) => p.period === ph.startPeriod);
    if (i >= 0) out.push(`<line x1="${x(i) - (x(1) - x(0)) / 2}" x2="${x(i) - (x(1) - x(0)) / 2}" y1="${pad.t}" y2="${H - pad.b}" stroke="${OI.black}" stroke-width="2"/><text x="${x(i) - 2}" y="${pad.t + 12}" fill="${OI.black}">phase ${ph.index + 1}</text>`);
  }
  chart.annotations.forEach((a, k) => {
    const i = pts.findIndex((p) => p.period === a.month || (chart.view === 'quarterly' && p.period === `${a.month.slice(0, 4)}-Q${Math.floor((Number(a.month.slice(5)) - 1) / 3) + 1}`));
    if (i < 0) return;
    out.push(`<line x1="${x(i)}" x2="${x(i)}" y1="${pad.t}" y2="${H - pad.b}" stroke="${OI.pink}" stroke-dasharray="2 3"/>`);
    out.push(`<text x="${x(i) + 3}" y="${pad.t + 14 + (k % 4) * 13}" fill="#7a3a63" font-size="11">${esc(`✎ ${a.siteCode && chart.scope.site === 'network' ? `${a.siteCode}: ` : ''}${a.text}`)}</text>`);
  });
  // Step lines for limits and centre, dashed median (per phase)
  const stepLine = (get: (i: number) => number | null, stroke: string, dash?: string) => {
    let d = '';
    pts.forEach((p, i) => {
      const v = get(i);
      const prev = i > 0 ? pts[i - 1] : null;
      if (v === null) return;
      const half = (x(1) - x(0)) / 2 || 10;
      const startNew = !prev || get(i - 1) === null || prev.phase !== p.phase;
      d += `${startNew ? 'M' : 'L'}${x(i) - half},${y(v)} L${x(i) + half},${y(v)} `;
    });
    if (d) out.push(`<path d="${d}" fill="none" stroke="${stroke}" stroke-width="1.5"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
  };
  stepLine((i) => pts[i].upper, OI.vermillion, '6 3');
  stepLine((i) => pts[i].lower, OI.vermillion, '6 3');
  stepLine((i) => pts[i].centre, OI.green);
  stepLine((i) => (pts[i].value === null ? null : pts[i].median), OI.orange, '2 2');
  // The series
  let d = '';
  pts.forEach((p, i) => {
    if (p.value === null) return;
    d += `${d && pts[i - 1]?.value !== null && pts[i - 1]?.phase === p.phase ? 'L' : 'M'}${x(i)},${y(p.value)} `;
  });
  out.push(`<path d="${d}" fill="none" stroke="${OI.blue}" stroke-width="2"/>`);
  const signalNumber = new Map(chart.signals.map((s, k) => [s.id, k + 1]));
  pts.forEach((p, i) => {
    if (p.value === null) return;
    const cx = x(i);
    const cy = y(p.value);
    if (p.signals.length) {
      // A signal point: a diamond (and a triangle when beyond a limit) with its signal number.
      out.push(`<path d="M${cx},${cy - 7} L${cx + 7},${cy} L${cx},${cy + 7} L${cx - 7},${cy} Z" fill="${p.provisional ? '#ffffff' : OI.vermillion}" stroke="${OI.vermillion}" stroke-width="2"/>`);
      const first = p.signals.filter((s) => chart.signals.find((x) => x.id === s)?.startPeriod === p.period).map((s) => signalNumber.get(s));
      if (first.length) out.push(`<text x="${cx}" y="${cy - 10}" text-anchor="middle" font-size="11" font-weight="bold" fill="${OI.black}">${first.join(',')}</text>`);
    } else {
      out.push(`<circle cx="${cx}" cy="${cy}" r="4" fill="${p.provisional ? '#ffffff' : OI.blue}" stroke="${OI.blue}" stroke-width="2"/>`);
    }
    if (p.outside) out.push(`<path d="M${cx},${cy + 10} l5,9 l-10,0 Z" fill="${OI.black}"/>`);
  });
  // Legend (words as well as colours)
  const ly = H - 14;
  const legend: [string, string, string][] = [
    [OI.blue, '', 'value'], [OI.green, '', 'centre line'], [OI.vermillion, '6 3', '3-sigma limits'], [OI.orange, '2 2', 'run-chart median'],
  ];
  let lx = pad.l;
  for (const [c, dash, label] of legend) {
    out.push(`<line x1="${lx}" x2="${lx + 22}" y1="${ly - 4}" y2="${ly - 4}" stroke="${c}" stroke-width="2"${dash ? ` stroke-dasharray="${dash}"` : ''}/><text x="${lx + 26}" y="${ly}">${label}</text>`);
    lx += 40 + label.length * 7;
  }
  out.push(`<path d="M${lx + 6},${ly - 11} L${lx + 13},${ly - 4} L${lx + 6},${ly + 3} L${lx - 1},${ly - 4} Z" fill="${OI.vermillion}"/><text x="${lx + 18}" y="${ly}">signal (numbered)</text>`);
  lx += 140;
  out.push(`<path d="M${lx + 6},${ly - 10} l5,9 l-10,0 Z" fill="${OI.black}"/><text x="${lx + 16}" y="${ly}">beyond a limit</text>`);
  out.push('</svg>');
  return out.join('\n');
}
