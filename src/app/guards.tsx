import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router-dom';
import { ErrorState, Loading, PageHeader } from '../components/ui.js';
import { userHasAccess, useSession } from '../lib/session.js';
import type { FeatureRoute } from './feature.js';

export function RequireSession({ children }: { children: ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (session.isPending) return <Loading what="your session" />;
  if (session.error) return <div className="p-6"><ErrorState error={session.error} retry={() => session.refetch()} /></div>;
  if (!session.data) return <Navigate to="/sign-in" replace state={{ from: location.pathname }} />;
  if (session.data.user.mustEnrollTotp && location.pathname !== '/account') return <Navigate to="/account" replace />;
  return <>{children}</>;
}

/** The client only hides what a role cannot use; the server enforces it. */
export function RequireRole({ route, children }: { route: FeatureRoute; children: ReactNode }) {
  const { data } = useSession();
  if (!data || !userHasAccess(data.user, route.roles, route.chair)) {
    return <div><PageHeader title="Not available for your role" /><p className="text-sm text-muted">Ask an administrator if you need this page.</p></div>;
  }
  return <>{children}</>;
}
