import { useJob } from '../api/imports.js';

/** A progress bar for a dry run or commit: rows parsed, validated and written, counted by the server. */
export function JobProgress({ jobId, phase }: { jobId: string | null; phase: 'dry run' | 'commit' }) {
  const job = useJob(jobId);
  const p = job.data?.progress ?? {};
  const total = Number(p.total ?? 0);
  const step = phase === 'commit' && p.written !== undefined ? Number(p.written) : Number(p.validated ?? p.parsed ?? 0);
  const label = phase === 'commit' && p.written !== undefined ? 'written' : p.validated !== undefined ? 'validated' : 'parsed';
  return (
    <div className="flex flex-col gap-1" aria-live="polite">
      <label htmlFor="import-progress" className="text-sm font-semibold">
        {phase === 'commit' ? 'Commit' : 'Dry run'} {job.data?.status === 'queued' ? 'waiting to start' : 'in progress'}
      </label>
      <progress id="import-progress" className="h-3 w-full" max={total || 1} value={total ? Math.min(step, total) : undefined} />
      <p className="text-xs text-muted tabular-nums">
        {Number(p.parsed ?? 0).toLocaleString()} parsed · {Number(p.validated ?? 0).toLocaleString()} validated{phase === 'commit' ? ` · ${Number(p.written ?? 0).toLocaleString()} written` : ''}{total ? ` of ${total.toLocaleString()} rows` : ''} ({label})
      </p>
    </div>
  );
}
