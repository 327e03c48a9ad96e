import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { MeasureKey } from '../../../shared/committee/measures.js';
import type { Finding } from '../../../shared/committee/review.js';
import { Button, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { userHasAccess, useSession } from '../../lib/session.js';
import { useChart } from './api/get-chart.js';
import { useMeasures, type MeasureRow } from './api/get-measures.js';
import { useActions, useAddAction, useMembers, useReview, useReviews, useSaveFinding, useSignOff, useUpdateAction } from './api/reviews.js';
import { periodLabel } from './components/format.js';

function MeasureReview({ month, m, finding, canRecord, signed }: { month: string; m: MeasureRow; finding?: Finding; canRecord: boolean; signed: boolean }) {
  const chart = useChart(m.key, { site: 'network', view: 'monthly', rebase: [], to: month });
  const save = useSaveFinding();
  const addAction = useAddAction();
  const members = useMembers(canRecord && !signed);
  const review = useReview(month);
  const [seen, setSeen] = useState(finding?.signalSeen ?? false);
  const [discussion, setDiscussion] = useState(finding?.discussion ?? '');
  const [desc, setDesc] = useState('');
  const [owner, setOwner] = useState('');
  const [due, setDue] = useState('');
  const id = `m-${m.key}`;
  const touching = chart.data?.signals.filter((s) => s.startPeriod <= month && s.endPeriod >= month) ?? [];
  const actions = review.data?.actions.filter((a) => a.measureKey === m.key) ?? [];
  const submit = (e: FormEvent) => { e.preventDefault(); save.mutate({ month, key: m.key, signalSeen: seen, discussion }); };
  const submitAction = (e: FormEvent) => {
    e.preventDefault();
    addAction.mutate({ month, measureKey: m.key as MeasureKey, description: desc, ownerId: owner, dueDate: due }, { onSuccess: () => { setDesc(''); setDue(''); } });
  };
  return (
    <Panel title={m.label}>
      {chart.isPending && <Loading what="the chart" />}
      {chart.data && (
        <p className="mb-2 text-sm">
          {chart.data.summary} {touching.length > 0 && <>Reaching {periodLabel(month)}: {touching.map((s) => `${s.label} (${s.chart === 'run' ? 'run chart' : chart.data.measure.chart}, ${periodLabel(s.startPeriod)}–${periodLabel(s.endPeriod)})`).join('; ')}.</>}{' '}
          <Link className="text-accent underline" to={`/committee/charts?measure=${m.key}`}>Charts</Link>
        </p>
      )}
      <form onSubmit={submit} className="flex flex-col gap-2">
        <label className="flex items-center gap-2 text-sm"><input type="checkbox" checked={seen} disabled={!canRecord || signed} onChange={(e) => setSeen(e.target.checked)} /> The committee saw a signal for this measure</label>
        <Field label="Discussion" htmlFor={`${id}-disc`}><textarea id={`${id}-disc`} className={inputClass} rows={2} value={discussion} disabled={!canRecord || signed} onChange={(e) => setDiscussion(e.target.value)} /></Field>
        {canRecord && !signed && <div><Button type="submit" variant="secondary" disabled={save.isPending}>Save finding for {m.short}</Button></div>}
        {finding && <p className="text-xs text-muted">Saved by {finding.updatedBy ?? '—'} at {finding.updatedAt.slice(0, 16).replace('T', ' ')}</p>}
        {save.error && <ErrorState error={save.error} />}
      </form>
      <h3 className="mb-1 mt-3 text-sm font-semibold">Actions</h3>
      {actions.length === 0 && <p className="text-sm text-muted">None.</p>}
      <ul className="text-sm">{actions.map((a) => <li key={a.id}>• {a.description} — {a.ownerName}, due {a.dueDate} ({a.overdue ? 'overdue' : a.status})</li>)}</ul>
      {canRecord && !signed && (
        <form onSubmit={submitAction} className="mt-2 flex flex-wrap items-end gap-2">
          <Field label="New action" htmlFor={`${id}-act`}><input id={`${id}-act`} className={`${inputClass} w-72`} value={desc} onChange={(e) => setDesc(e.target.value)} required minLength={5} /></Field>
          <Field label="Owner" htmlFor={`${id}-owner`}>
            <select id={`${id}-owner`} className={inputClass} value={owner} onChange={(e) => setOwner(e.target.value)} required>
              <option value="">Choose…</option>
              {members.data?.items.map((u) => <option key={u.id} value={u.id}>{u.displayName}</option>)}
            </select>
          </Field>
          <Field label="Due date" htmlFor={`${id}-due`}><input id={`${id}-due`} type="date" className={inputClass} value={due} onChange={(e) => setDue(e.target.value)} required /></Field>
          <Button type="submit" variant="secondary" disabled={addAction.isPending}>Add action</Button>
          {addAction.error && <ErrorState error={addAction.error} />}
        </form>
      )}
    </Panel>
  );
}

export function ReviewPage() {
  const { month } = useParams() as { month: string };
  const review = useReview(month);
  const measures = useMeasures();
  const signOff = useSignOff();
  const { data } = useSession();
  const user = data?.user;
  const canRecord = !!user && userHasAccess(user, ['admin', 'committee']);
  const chair = !!user && userHasAccess(user, ['admin', 'committee'], true);
  const r = review.data;
  const signed = r?.status === 'signed';
  return (
    <div>
      <PageHeader title={`Review of ${periodLabel(month)}`} subtitle="For each measure: whether a signal was seen, the discussion, and the actions agreed. The chair signs the review off."
        actions={<><Link className="text-sm text-accent underline" to="/committee/reviews">All reviews</Link><Link className="text-sm text-accent underline" to={`/committee/packet/${month}/print`}>Printable page</Link></>} />
      {(review.isPending || measures.isPending) && <Loading what="the review" />}
      {review.error && <ErrorState error={review.error} />}
      {r && (
        <div className="mb-4">
          {signed ? <Notice tone="ok">Signed off by {r.signedBy} on {r.signedAt?.slice(0, 10)}. The findings are fixed; actions can still be marked done.</Notice>
            : <Notice>Status: {r.status === 'draft' ? 'recorded, not signed off' : 'nothing recorded yet'}.</Notice>}
        </div>
      )}
      {r && measures.data && (
        <div className="flex flex-col gap-4">
          {measures.data.items.filter((m) => m.enabled).map((m) => (
            <MeasureReview key={`${m.key}-${r.findings.find((f) => f.measureKey === m.key)?.updatedAt ?? ''}`} month={month} m={m} finding={r.findings.find((f) => f.measureKey === m.key)} canRecord={canRecord} signed={signed} />
          ))}
          {chair && !signed && (
            <Panel title="Sign-off">
              <p className="mb-2 text-sm">Signing off fixes the findings of {periodLabel(month)}. The month must be closed first.</p>
              <Button onClick={() => signOff.mutate(month)} disabled={signOff.isPending}>Sign off the review</Button>
              {signOff.error && <div className="mt-2"><ErrorState error={signOff.error} /></div>}
            </Panel>
          )}
        </div>
      )}
    </div>
  );
}

export function ReviewsPage() {
  const reviews = useReviews();
  const actions = useActions('open');
  const update = useUpdateAction();
  return (
    <div>
      <PageHeader title="Reviews and actions" subtitle="Earlier monthly reviews and the actions still open." />
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Reviews">
          {reviews.isPending && <Loading what="reviews" />}
          {reviews.error && <ErrorState error={reviews.error} />}
          {reviews.data?.items.length === 0 && <p className="text-sm text-muted">No review recorded yet. Open a month from Month close.</p>}
          <ul className="flex flex-col gap-1 text-sm">
            {reviews.data?.items.map((r) => (
              <li key={r.month}><Link className="text-accent underline" to={`/committee/reviews/${r.month}`}>{periodLabel(r.month)}</Link> — {r.status === 'signed' ? `signed off by ${r.signedBy}` : 'not signed off'}; {r.findings} finding(s), {r.signals} with a signal, {r.openActions} open action(s)</li>
            ))}
          </ul>
        </Panel>
        <Panel title="Open actions">
          {actions.isPending && <Loading what="actions" />}
          {actions.data?.items.length === 0 && <p className="text-sm text-muted">No open action.</p>}
          <ul className="flex flex-col gap-2 text-sm">
            {actions.data?.items.map((a) => (
              <li key={a.id} className="rounded border border-line p-2">
                <p>{a.description}</p>
                <p className="text-xs text-muted">{a.ownerName} · due {a.dueDate}{a.overdue && <strong className="ml-1 text-danger">overdue</strong>} · review of {periodLabel(a.month)}</p>
                <Button variant="ghost" onClick={() => update.mutate({ id: a.id, status: 'done' })}>Mark done</Button>
              </li>
            ))}
          </ul>
          {update.error && <ErrorState error={update.error} />}
        </Panel>
      </div>
    </div>
  );
}
