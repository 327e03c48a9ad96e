import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { userHasAccess, useSession } from '../../lib/session.js';
import { useCloseMonth, useMonth, useMonths, usePublishMonth, useReopenMonth } from './api/months.js';
import { periodLabel } from './components/format.js';

function MonthPanel({ month, chair, pin }: { month: string; chair: boolean; pin: () => void }) {
  const detail = useMonth(month);
  const close = useCloseMonth();
  const reopen = useReopenMonth();
  const publish = usePublishMonth();
  const [reason, setReason] = useState('');
  const d = detail.data;
  if (detail.isPending) return <Loading what="the month" />;
  if (detail.error) return <ErrorState error={detail.error} />;
  if (!d) return null;
  return (
    <Panel title={`${periodLabel(month)}: ${d.closed ? 'closed' : d.ended ? 'open (provisional)' : 'running (provisional)'}`}>
      <table className="mb-3 w-full text-sm">
        <caption className="text-left text-xs text-muted">Completeness of the registry for cases operated in {periodLabel(month)}</caption>
        <thead><tr className="text-left"><th scope="col" className="p-1">Site</th><th scope="col" className="p-1 text-right">Cases</th><th scope="col" className="p-1 text-right">Draft</th><th scope="col" className="p-1 text-right">Complete (abstracted)</th><th scope="col" className="p-1 text-right">Verified</th><th scope="col" className="p-1 text-right">Locked</th><th scope="col" className="p-1 text-right">Withdrawn</th><th scope="col" className="p-1 text-right">Outcome windows open</th></tr></thead>
        <tbody>
          {[...d.sites, { siteId: 'total', siteCode: 'All', siteName: 'All sites', ...d.totals }].map((s) => (
            <tr key={s.siteId} className={`border-t border-line ${s.siteId === 'total' ? 'font-semibold' : ''}`}>
              <th scope="row" className="p-1 text-left font-normal">{s.siteName}</th>
              <td className="p-1 text-right">{s.cases}</td><td className="p-1 text-right">{s.draft}</td><td className="p-1 text-right">{s.complete}</td>
              <td className="p-1 text-right">{s.verified}</td><td className="p-1 text-right">{s.locked}</td><td className="p-1 text-right">{s.withdrawn}</td><td className="p-1 text-right">{s.windowsOpen}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {d.totals.draft + d.totals.complete > 0 && !d.closed && <Notice tone="warn">{d.totals.draft + d.totals.complete} case(s) are not verified yet: closing locks only verified cases; the others stay open to editing and count when complete.</Notice>}
      {d.totals.windowsOpen > 0 && !d.closed && <div className="mt-2"><Notice tone="warn">{d.totals.windowsOpen} case(s) still have their 30-day follow-up window open: their outcomes may still change.</Notice></div>}
      {d.closed && <p className="text-sm">Closed {d.closedAt?.slice(0, 10)} by {d.closedBy ?? '—'}. {d.publishedAt ? `Published ${d.publishedAt.slice(0, 10)}.` : 'Not published yet.'} Review: {d.reviewStatus === 'signed' ? 'signed off' : d.reviewStatus === 'draft' ? 'recorded, not signed off' : 'not recorded'}.</p>}
      <div className="mt-3 flex flex-wrap items-end gap-2">
        <Link className="text-sm text-accent underline" to={`/committee/reviews/${month}`}>Open the review of {periodLabel(month)}</Link>
        {d.packetJobId && <Link className="text-sm text-accent underline" to={`/committee/packet/${month}`}>Review packet</Link>}
      </div>
      {chair && (
        <div className="mt-3 flex flex-wrap items-end gap-3 border-t border-line pt-3 no-print">
          {!d.closed && <Button disabled={!d.ended || close.isPending} onClick={() => { pin(); close.mutate({ month }); }}>Close {periodLabel(month)}</Button>}
          {d.closed && <Button onClick={() => { pin(); publish.mutate({ month }); }} disabled={publish.isPending}>{d.publishedAt ? 'Publish again (new packet)' : 'Publish the review'}</Button>}
          {d.closed && (
            <>
              <Field label="Reason for re-opening" htmlFor="reopen-reason"><input id="reopen-reason" className={`${inputClass} w-80`} value={reason} onChange={(e) => setReason(e.target.value)} /></Field>
              <Button variant="danger" disabled={reason.trim().length < 5 || reopen.isPending} onClick={() => { pin(); reopen.mutate({ month, body: { reason } }, { onSuccess: () => setReason('') }); }}>Re-open</Button>
            </>
          )}
        </div>
      )}
      {close.data && <div className="mt-2"><Notice tone="ok">Closed: {close.data.locked} case(s) locked, {close.data.notLocked} not verified; {close.data.signalsNotified} new signal(s) e-mailed to the committee and the sites' analysts.</Notice></div>}
      {publish.data && <div className="mt-2"><Notice tone="ok">Publishing: the packet is being prepared. <Link className="underline" to={`/committee/packet/${month}`}>Follow its progress</Link>.</Notice></div>}
      {[close.error, reopen.error, publish.error].filter(Boolean).map((e, i) => <div key={i} className="mt-2"><ErrorState error={e} /></div>)}
    </Panel>
  );
}

export function MonthClosePage() {
  const months = useMonths();
  const { data } = useSession();
  const chair = !!data && userHasAccess(data.user, ['admin', 'committee'], true);
  const [month, setMonth] = useState<string | null>(null);
  // By default the oldest month that has ended and is still open: months are closed in order.
  const items = months.data?.items ?? [];
  const selected = month ?? [...items].reverse().find((m) => !m.closed && m.month < (items[0]?.month ?? ''))?.month ?? items[0]?.month ?? null;
  return (
    <div>
      <PageHeader title="Month close" subtitle="See a month's completeness, close it (its verified cases lock), re-open it with a reason, publish its review." />
      {!chair && <div className="mb-3"><Notice>Only the committee chair or an administrator closes, re-opens and publishes a month.</Notice></div>}
      {months.isPending && <Loading what="months" />}
      {months.error && <ErrorState error={months.error} />}
      <div className="grid gap-4 lg:grid-cols-[16rem_1fr]">
        <nav aria-label="Months">
          <ul className="flex flex-col gap-1 text-sm">
            {months.data?.items.map((m) => (
              <li key={m.month}>
                <button type="button" onClick={() => setMonth(m.month)} aria-current={selected === m.month ? 'true' : undefined}
                  className={`flex w-full justify-between rounded px-2 py-1 text-left ${selected === m.month ? 'bg-accent text-white' : 'hover:bg-accent-soft'}`}>
                  <span>{periodLabel(m.month)}</span>
                  <span className="text-xs">{m.closed ? (m.publishedAt ? 'closed · published' : 'closed') : 'open'}{m.reviewStatus === 'signed' ? ' · signed' : ''}</span>
                </button>
              </li>
            ))}
          </ul>
        </nav>
        {selected && <MonthPanel key={selected} month={selected} chair={chair} pin={() => setMonth(selected)} />}
      </div>
    </div>
  );
}
