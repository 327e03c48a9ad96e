import { useEffect } from 'react';
import { NavLink, Outlet, useNavigate } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import { ROLE_LABELS } from '../../shared/auth/roles.js';
import { onUnauthorised } from '../lib/api-client.js';
import { queryKeys } from '../lib/query-keys.js';
import { userHasAccess, useSession } from '../lib/session.js';
import { useSignOut } from '../features/sign-in/api/sign-in.js';
import { NAV_GROUPS, type FeatureRoute } from './feature.js';

/** The shell: a left navigation by task and a content column. */
export function Layout({ routes }: { routes: FeatureRoute[] }) {
  const { data } = useSession();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const qc = useQueryClient();
  useEffect(
    () =>
      onUnauthorised((e) => {
        qc.setQueryData(queryKeys.me, null);
        navigate(e.code === 'session_expired' ? '/sign-in?expired=1' : '/sign-in', { replace: true });
      }),
    [navigate, qc],
  );
  const user = data!.user;
  const visible = routes.filter((r) => r.nav && userHasAccess(user, r.roles, r.chair) && (!r.demoOnly || data!.demoMode));
  return (
    <div className="flex min-h-screen flex-col md:flex-row">
      <nav aria-label="Main" className="w-full shrink-0 border-b border-line bg-ink text-white md:w-60 md:border-b-0 md:border-r">
        <div className="px-4 py-4">
          <NavLink to="/" className="text-xl font-bold tracking-tight">Alveolog</NavLink>
          <p className="text-xs text-white/70">PPC surveillance registry</p>
        </div>
        <div className="flex flex-wrap gap-x-4 px-2 pb-3 md:block">
          {NAV_GROUPS.map((g) => {
            const items = visible.filter((r) => r.nav!.group === g).sort((a, b) => a.nav!.order - b.nav!.order);
            if (!items.length) return null;
            return (
              <div key={g} className="mb-3">
                <p className="px-2 text-xs font-semibold uppercase tracking-wide text-white/60">{g}</p>
                <ul>
                  {items.map((r) => (
                    <li key={r.path}>
                      <NavLink to={r.path} end className={({ isActive }) => `block rounded px-2 py-1 text-sm ${isActive ? 'bg-accent text-white' : 'text-white/90 hover:bg-white/10'}`}>
                        {r.nav!.label}
                      </NavLink>
                    </li>
                  ))}
                </ul>
              </div>
            );
          })}
        </div>
        <div className="border-t border-white/20 px-4 py-3 text-xs">
          <p className="font-semibold">{user.displayName}</p>
          <p className="text-white/70">{user.roles.map((r) => ROLE_LABELS[r]).join(', ')}</p>
          <div className="mt-2 flex gap-3">
            <NavLink to="/account" className="underline">Account</NavLink>
            <button type="button" className="underline" onClick={() => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in') })}>Sign out</button>
          </div>
        </div>
      </nav>
      <main className="min-w-0 flex-1 p-4 md:p-6" id="content">
        {data!.demoMode && <p className="no-print mb-3 rounded bg-warn-soft px-3 py-1 text-xs text-ochre">Demo mode: every hospital, person and number here is fictional.</p>}
        <Outlet />
      </main>
    </div>
  );
}
