import { CASE_STATUS_LABELS, type CaseStatus } from '../../shared/clinical/codes.js';

/** Status tokens from styles.css; the word is always shown, so colour is never the only signal. */
const STATUS_CLASS: Record<CaseStatus, string> = {
  draft: 'border-status-draft text-status-draft',
  complete: 'border-status-complete text-status-complete',
  verified: 'border-status-verified text-status-verified',
  locked: 'border-status-locked text-status-locked',
  withdrawn: 'border-status-withdrawn text-status-withdrawn',
};
/** A small shape per status, as a second cue beside colour and word. */
const STATUS_MARK: Record<CaseStatus, string> = { draft: '○', complete: '◐', verified: '●', locked: '■', withdrawn: '×' };

export function StatusBadge({ status }: { status: CaseStatus }) {
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border bg-panel px-2 py-0.5 text-xs font-semibold ${STATUS_CLASS[status]}`}>
      <span aria-hidden="true">{STATUS_MARK[status]}</span>
      {CASE_STATUS_LABELS[status]}
    </span>
  );
}
