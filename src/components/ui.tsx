import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { getErrorMessage } from '../lib/api-client.js';

export function PageHeader({ title, subtitle, actions }: { title: string; subtitle?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-line pb-3">
      <div>
        <h1 className="text-2xl font-semibold text-ink">{title}</h1>
        {subtitle && <p className="mt-1 text-sm text-muted">{subtitle}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2 no-print">{actions}</div>}
    </header>
  );
}

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';
const VARIANTS: Record<Variant, string> = {
  primary: 'bg-accent text-white hover:bg-accent-strong disabled:bg-muted',
  secondary: 'bg-panel text-ink border border-line hover:border-accent',
  danger: 'bg-danger text-white hover:opacity-90',
  ghost: 'text-accent hover:underline',
};
export function Button({ variant = 'primary', className = '', ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button className={`inline-flex items-center gap-1 rounded px-3 py-1.5 text-sm font-semibold disabled:cursor-not-allowed ${VARIANTS[variant]} ${className}`} {...rest} />;
}

export function Panel({ title, children, className = '' }: { title?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded border border-line bg-panel p-4 ${className}`}>
      {title && <h2 className="mb-3 text-base font-semibold">{title}</h2>}
      {children}
    </section>
  );
}

export function Loading({ what = 'data' }: { what?: string }) {
  return <p role="status" className="p-4 text-sm text-muted">Loading {what}…</p>;
}

export function ErrorState({ error, retry }: { error: unknown; retry?: () => void }) {
  return (
    <div role="alert" className="rounded border border-danger bg-danger-soft p-3 text-sm text-danger">
      <p>{getErrorMessage(error)}</p>
      {retry && <Button variant="secondary" className="mt-2" onClick={retry}>Try again</Button>}
    </div>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded border border-dashed border-line p-6 text-center text-sm text-muted">
      <p className="font-semibold text-ink">{title}</p>
      {children && <div className="mt-1">{children}</div>}
    </div>
  );
}

export function Notice({ tone = 'info', children }: { tone?: 'info' | 'warn' | 'ok' | 'danger'; children: ReactNode }) {
  const cls = { info: 'bg-accent-soft border-accent', warn: 'bg-warn-soft border-ochre', ok: 'bg-ok-soft border-ok', danger: 'bg-danger-soft border-danger' }[tone];
  return <div className={`rounded border-l-4 p-3 text-sm ${cls}`}>{children}</div>;
}

/** The standing caution on every screen that touches therapy settings or clinical thresholds. */
export function ClinicalCaution() {
  return (
    <Notice tone="warn">
      Alveolog supports surveillance and quality improvement, not bedside decisions. Follow local protocols, codes and licensed practice; the clinician's judgement decides.
    </Notice>
  );
}

export function Field({ label, htmlFor, error, hint, children }: { label: string; htmlFor: string; error?: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={htmlFor} className="text-sm font-semibold">{label}</label>
      {children}
      {hint && !error && <p className="text-xs text-muted">{hint}</p>}
      {error && <p id={`${htmlFor}-error`} className="text-xs text-danger" role="alert">{error}</p>}
    </div>
  );
}

export const inputClass = 'rounded border border-line bg-white px-2 py-1.5 text-sm focus:border-accent';
