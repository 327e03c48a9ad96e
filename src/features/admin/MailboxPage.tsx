import { EmptyState, ErrorState, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { useMail } from './api/admin.js';

/** The demo stand-in mailbox: what Alveolog would have e-mailed (demo mode only). */
export function MailboxPage() {
  const mail = useMail();
  return (
    <div>
      <PageHeader title="Demo mailbox" subtitle="Messages the local stand-in mail server received. This page exists only in demo mode." />
      <Notice>In production, Alveolog sends these through the SMTP server named in its configuration.</Notice>
      <div className="mt-4 flex flex-col gap-3">
        {mail.isPending && <Loading what="messages" />}
        {mail.error && <ErrorState error={mail.error} />}
        {mail.data?.items.length === 0 && <EmptyState title="No messages yet" />}
        {mail.data?.items.map((m) => (
          <Panel key={m.id} title={m.subject}>
            <p className="text-xs text-muted">To {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString()}</p>
            <pre className="mt-2 whitespace-pre-wrap break-words font-sans text-sm">{m.body}</pre>
          </Panel>
        ))}
      </div>
    </div>
  );
}
