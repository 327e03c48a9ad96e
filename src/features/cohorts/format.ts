/** Number formatting of the cohort views: intervals as "8.1% (95% CI 6.9–9.4)", units always shown. */
export const OKABE_ITO = { orange: '#e69f00', sky: '#56b4e9', green: '#009e73', yellow: '#f0e442', blue: '#0072b2', vermillion: '#d55e00', pink: '#cc79a7', black: '#000000' };

export const levelLabel = (level: number) => `${Math.round(level * 100)}%`;

export function fmtValue(v: number | null | undefined, kind: 'proportion' | 'rate' | 'ratio' | 'difference', digits = 1): string {
  if (v == null || !Number.isFinite(v)) return '—';
  if (kind === 'proportion') return `${(v * 100).toFixed(digits)}%`;
  if (kind === 'difference') return `${v >= 0 ? '+' : '−'}${Math.abs(v * 100).toFixed(digits)} points`;
  if (kind === 'rate') return v.toFixed(2);
  return v.toFixed(2);
}

export function fmtInterval(i: { estimate: number | null; lower: number | null; upper: number | null }, kind: 'proportion' | 'rate' | 'ratio' | 'difference', level: number): string {
  if (i.estimate == null) return '—';
  const unit = kind === 'proportion' ? '%' : kind === 'difference' ? ' points' : '';
  const scale = (x: number | null) => (x == null ? '∞' : kind === 'proportion' || kind === 'difference' ? (x * 100).toFixed(1) : x.toFixed(2));
  const est = kind === 'rate' ? i.estimate.toFixed(2) : kind === 'ratio' ? i.estimate.toFixed(2) : fmtValue(i.estimate, kind);
  return `${est} (${levelLabel(level)} CI ${scale(i.lower)}–${scale(i.upper)}${unit})`;
}

export const fmtCount = (n: number | null | undefined) => (n == null ? 'suppressed' : n.toLocaleString('en'));
export const fmtP = (p: number | null | undefined) => (p == null ? '—' : p < 0.0001 ? '< 0.0001' : p.toFixed(4));
