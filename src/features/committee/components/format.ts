import type { ChartResponse } from '../../../../shared/committee/chart.js';

/** Okabe & Ito's colour-blind-safe palette: the same values as the chart-1..8 theme tokens. */
export const OKABE_ITO = { blue: '#0072b2', orange: '#e69f00', green: '#009e73', pink: '#cc79a7', sky: '#56b4e9', vermillion: '#d55e00', yellow: '#f0e442', black: '#000000' };

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
export function periodLabel(p: string): string {
  if (p.includes('Q')) return p.replace('-', ' ');
  const [y, m] = p.split('-').map(Number);
  return `${MONTHS[m - 1]} ${y}`;
}

/** A value with its unit beside it (%, days, per 1,000 patient-days). */
export function withUnit(v: number | null | undefined, unit: string): string {
  if (v === null || v === undefined) return '—';
  if (unit === '%') return `${v.toFixed(1)}%`;
  if (unit === 'days') return `${v.toFixed(1)} days`;
  return `${v.toFixed(2)} ${unit}`;
}

export function numeratorLabel(c: ChartResponse): [string, string] {
  if (c.measure.key === 'median-length-of-stay') return ['Median (days)', 'Discharged cases'];
  if (c.measure.key === 'therapy-adherence') return ['Sum of adherence', 'Cases with sessions prescribed'];
  if (c.measure.kind === 'rate') return ['Pneumonias', 'Patient-days'];
  return ['Cases with the outcome', 'Counted cases'];
}
