import { Link, useParams } from 'react-router-dom';
import { ErrorState, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { ApiError } from '../../lib/api-client.js';
import { usePacket } from './api/months.js';
import { periodLabel } from './components/format.js';

export function PacketPage() {
  const { month } = useParams() as { month: string };
  const packet = usePacket(month);
  const j = packet.data;
  const progress = j?.progress ?? {};
  const total = Number(progress.total ?? 0);
  const done = Number(progress.done ?? 0);
  return (
    <div>
      <PageHeader title={`Review packet — ${periodLabel(month)}`} subtitle="An Excel workbook: a summary of signals, findings and actions, and one sheet per measure with its monthly table and chart image."
        actions={<Link className="text-sm text-accent underline" to={`/committee/packet/${month}/print`}>Printable page</Link>} />
      {packet.isPending && <Loading what="the packet" />}
      {packet.error && (packet.error instanceof ApiError && packet.error.status === 404
        ? <Notice>No packet yet: the chair publishes the month from <Link className="underline" to="/committee/months">Month close</Link>.</Notice>
        : <ErrorState error={packet.error} />)}
      {j && (
        <Panel>
          <p className="text-sm" role="status">Status: <strong>{j.status === 'succeeded' ? 'ready' : j.status}</strong>{progress.step ? ` — ${progress.step}` : ''}</p>
          {(j.status === 'queued' || j.status === 'running') && (
            <progress className="mt-2 w-full" max={total || 1} value={done} aria-label="Packet progress">{done} of {total}</progress>
          )}
          {j.status === 'succeeded' && (
            <p className="mt-2 text-sm">
              <a className="font-semibold text-accent underline" href={`/api/committee/months/${month}/packet/file`} download>Download the workbook (.xlsx)</a>
              {' '}— {String(j.result?.measures ?? '')} measure sheets, {String(j.result?.signals ?? '')} signals; e-mailed to {String(j.result?.emailed ?? 0)} committee member(s).
            </p>
          )}
          {j.status === 'failed' && <ErrorState error={new Error(j.error ?? 'the packet could not be made')} />}
        </Panel>
      )}
    </div>
  );
}
