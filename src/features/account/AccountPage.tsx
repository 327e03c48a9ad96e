import { useState, type FormEvent } from 'react';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse } from '../../../shared/auth/user.js';
import { ROLE_LABELS } from '../../../shared/auth/roles.js';
import { Button, ErrorState, Field, inputClass, Notice, PageHeader, Panel } from '../../components/ui.js';
import { post, setCsrfToken } from '../../lib/api-client.js';
import { queryKeys } from '../../lib/query-keys.js';
import { useSession } from '../../lib/session.js';

export function AccountPage() {
  const session = useSession();
  const qc = useQueryClient();
  const [code, setCode] = useState('');
  const setup = useMutation({ mutationFn: () => post<{ secret: string; otpauthUrl: string }>('/api/auth/totp/setup') });
  const confirm = useMutation({
    mutationFn: (c: string) => post<MeResponse>('/api/auth/totp/confirm', { code: c }),
    onSuccess: (me) => { setCsrfToken(me.csrfToken); qc.setQueryData(queryKeys.me, me); },
  });
  const user = session.data?.user;
  if (!user) return null;
  const submit = (e: FormEvent) => { e.preventDefault(); confirm.mutate(code); };
  return (
    <div>
      <PageHeader title="Your account" subtitle={`${user.displayName} · ${user.email}`} />
      <div className="flex flex-col gap-5">
        <Panel title="Roles">
          <p className="text-sm">{user.roles.map((r) => ROLE_LABELS[r]).join(', ')}{user.isChair ? ' (committee chair)' : ''}</p>
        </Panel>
        <Panel title="Two-step sign-in">
          {user.mustEnrollTotp && <Notice tone="warn">Administrators must set up two-step sign-in before using Alveolog.</Notice>}
          {user.totpEnabled ? (
            <Notice tone="ok">Two-step sign-in is on. You will be asked for a code from your authenticator app at each sign-in.</Notice>
          ) : (
            <div className="flex flex-col gap-3">
              <p className="text-sm text-muted">Add Alveolog to an authenticator app (any app that follows RFC 6238 time-based codes), then type the code it shows.</p>
              {!setup.data && <div><Button onClick={() => setup.mutate()} disabled={setup.isPending}>Set up two-step sign-in</Button></div>}
              {setup.error && <ErrorState error={setup.error} />}
              {setup.data && (
                <form onSubmit={submit} className="flex flex-col gap-3">
                  <p className="text-sm">Secret key to type into the app: <code className="rounded bg-accent-soft px-1 font-mono" data-testid="totp-secret">{setup.data.secret}</code></p>
                  <p className="break-all text-xs text-muted">Or open this set-up address on the phone: {setup.data.otpauthUrl}</p>
                  <Field label="Code from the app" htmlFor="totp-code"><input id="totp-code" inputMode="numeric" pattern="\d{6}" className={inputClass} value={code} onChange={(e) => setCode(e.target.value)} required /></Field>
                  {confirm.error && <ErrorState error={confirm.error} />}
                  <div><Button type="submit" disabled={confirm.isPending}>Turn on</Button></div>
                </form>
              )}
            </div>
          )}
        </Panel>
      </div>
    </div>
  );
}
