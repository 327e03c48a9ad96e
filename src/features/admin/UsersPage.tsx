import { useState, type FormEvent } from 'react';
import { ROLES, ROLE_LABELS, type Role } from '../../../shared/auth/roles.js';
import { Button, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { useInviteUser, useSendReset, useSites, useUpdateUser, useUsers } from './api/admin.js';

function InviteForm() {
  const sites = useSites();
  const invite = useInviteUser();
  const [email, setEmail] = useState('');
  const [displayName, setDisplayName] = useState('');
  const [roles, setRoles] = useState<Role[]>([]);
  const [siteIds, setSiteIds] = useState<string[]>([]);
  const [isChair, setIsChair] = useState(false);
  const toggle = <T,>(list: T[], v: T) => (list.includes(v) ? list.filter((x) => x !== v) : [...list, v]);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    invite.mutate({ email, displayName, roles, siteIds, isChair }, { onSuccess: () => { setEmail(''); setDisplayName(''); setRoles([]); setSiteIds([]); setIsChair(false); } });
  };
  return (
    <Panel title="Invite a user">
      <form onSubmit={submit} className="grid gap-3 md:grid-cols-2">
        <Field label="E-mail" htmlFor="invite-email"><input id="invite-email" type="email" required className={inputClass} value={email} onChange={(e) => setEmail(e.target.value)} /></Field>
        <Field label="Display name" htmlFor="invite-name"><input id="invite-name" required className={inputClass} value={displayName} onChange={(e) => setDisplayName(e.target.value)} /></Field>
        <fieldset className="flex flex-col gap-1">
          <legend className="text-sm font-semibold">Roles</legend>
          {ROLES.map((r) => (
            <label key={r} className="flex items-center gap-2 text-sm"><input type="checkbox" checked={roles.includes(r)} onChange={() => setRoles(toggle(roles, r))} /> {ROLE_LABELS[r]}</label>
          ))}
          {roles.includes('committee') && <label className="flex items-center gap-2 text-sm"><input type="checkbox" checked={isChair} onChange={() => setIsChair(!isChair)} /> Committee chair</label>}
        </fieldset>
        <fieldset className="flex flex-col gap-1">
          <legend className="text-sm font-semibold">Sites (case-level access)</legend>
          {sites.data?.items.map((s) => (
            <label key={s.id} className="flex items-center gap-2 text-sm"><input type="checkbox" checked={siteIds.includes(s.id)} onChange={() => setSiteIds(toggle(siteIds, s.id))} /> {s.name}</label>
          ))}
        </fieldset>
        <div className="md:col-span-2 flex flex-col gap-2">
          {invite.error && <ErrorState error={invite.error} />}
          {invite.isSuccess && <Notice tone="ok">Invitation sent. The link works once, for 72 hours.</Notice>}
          <div><Button type="submit" disabled={invite.isPending || roles.length === 0}>Send invitation</Button></div>
        </div>
      </form>
    </Panel>
  );
}

export function UsersPage() {
  const users = useUsers();
  const sites = useSites();
  const update = useUpdateUser();
  const reset = useSendReset();
  const siteName = (id: string) => sites.data?.items.find((s) => s.id === id)?.code ?? '?';
  return (
    <div>
      <PageHeader title="Users" subtitle="Roles decide what a person may do; sites decide whose cases they may see." />
      <div className="flex flex-col gap-5">
        <InviteForm />
        <Panel title="Everyone">
          {users.isPending && <Loading what="users" />}
          {users.error && <ErrorState error={users.error} retry={() => users.refetch()} />}
          {update.error && <ErrorState error={update.error} />}
          {users.data && users.data.items.length === 0 && <EmptyState title="No users yet" />}
          {users.data && users.data.items.length > 0 && (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <thead className="border-b border-line text-muted"><tr><th className="py-2 pr-3">Name</th><th className="pr-3">E-mail</th><th className="pr-3">Roles</th><th className="pr-3">Sites</th><th className="pr-3">State</th><th>Actions</th></tr></thead>
                <tbody>
                  {users.data.items.map((u) => (
                    <tr key={u.id} className="border-b border-line/60">
                      <td className="py-2 pr-3">{u.displayName}</td>
                      <td className="pr-3">{u.email}</td>
                      <td className="pr-3">{u.roles.map((r) => ROLE_LABELS[r]).join(', ')}{u.isChair ? ' (chair)' : ''}</td>
                      <td className="pr-3">{u.siteIds.map(siteName).join(', ') || '—'}</td>
                      <td className="pr-3">{!u.active ? 'Deactivated' : u.invitePending ? 'Invitation pending' : u.lockedUntil && new Date(u.lockedUntil) > new Date() ? 'Locked' : 'Active'}{u.totpEnabled ? ' · two-step' : ''}</td>
                      <td className="flex gap-1 py-1">
                        <Button variant="secondary" onClick={() => reset.mutate(u.id)}>Send reset</Button>
                        <Button variant="secondary" onClick={() => update.mutate({ id: u.id, active: !u.active })}>{u.active ? 'Deactivate' : 'Reactivate'}</Button>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {reset.isSuccess && <Notice tone="ok">Reset e-mail sent.</Notice>}
        </Panel>
      </div>
    </div>
  );
}
