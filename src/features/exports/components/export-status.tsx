import { EXPORT_STATUS_LABELS, type ExportRequestView } from '../../../../shared/exports/schemas.js';

const TONE: Record<string, string> = {
  pending: 'bg-warn-soft text-ink border-ochre', declined: 'bg-danger-soft text-danger border-danger', approved: 'bg-accent-soft text-ink border-accent',
  generating: 'bg-accent-soft text-ink border-accent', ready: 'bg-ok-soft text-ink border-ok', failed: 'bg-danger-soft text-danger border-danger', expired: 'bg-panel text-muted border-line',
};

/** Status in words (never colour alone). */
export function ExportStatus({ status }: { status: ExportRequestView['status'] }) {
  return <span className={`inline-block rounded border px-2 py-0.5 text-xs font-semibold ${TONE[status] ?? ''}`}>{EXPORT_STATUS_LABELS[status]}</span>;
}

/** Generation progress as a labelled bar (rows written of the total). */
export function ExportProgress({ view }: { view: ExportRequestView }) {
  if (view.status !== 'approved' && view.status !== 'generating') return null;
  const written = Number(view.progress?.written ?? 0);
  const total = Number(view.progress?.total ?? 0);
  const pct = total > 0 ? Math.min(100, Math.round((written / total) * 100)) : 0;
  const label = total > 0 ? `${written.toLocaleString('en')} of ${total.toLocaleString('en')} rows (${pct}%)` : 'queued';
  return (
    <div className="flex min-w-40 flex-col gap-1">
      <div role="progressbar" aria-label="Generation progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} aria-valuetext={label} className="h-2 w-full overflow-hidden rounded bg-line">
        <div className="h-full bg-accent" style={{ width: `${pct}%` }} />
      </div>
      <span className="text-xs text-muted tabular-nums">{label}</span>
    </div>
  );
}
