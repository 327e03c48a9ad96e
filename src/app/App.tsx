import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createBrowserRouter, RouterProvider, useRouteError } from 'react-router-dom';
import { ApiError } from '../lib/api-client.js';
import { ErrorState, PageHeader } from '../components/ui.js';
import { SignInPage } from '../features/sign-in/SignInPage.js';
import { SetPasswordPage } from '../features/sign-in/SetPasswordPage.js';
import { Layout } from './Layout.js';
import { RequireRole, RequireSession } from './guards.js';
import { featureRoutes } from './routes.js';

/** One QueryClient with deliberate defaults: no retry on 4xx, short staleness for registry data. */
const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      refetchOnWindowFocus: false,
      retry: (count, err) => !(err instanceof ApiError && err.status < 500) && count < 2,
    },
  },
});

function RouteError() {
  const error = useRouteError();
  return <div className="p-6"><PageHeader title="This page could not be shown" /><ErrorState error={error} /></div>;
}

const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage />, errorElement: <RouteError /> },
  { path: '/reset-password', element: <SetPasswordPage kind="reset" />, errorElement: <RouteError /> },
  { path: '/accept-invitation', element: <SetPasswordPage kind="invite" />, errorElement: <RouteError /> },
  {
    path: '/',
    element: <RequireSession><Layout routes={featureRoutes} /></RequireSession>,
    errorElement: <RouteError />,
    children: [
      ...featureRoutes.map((r) => ({ path: r.path === '/' ? undefined : r.path, index: r.path === '/' ? true : undefined, element: <RequireRole route={r}>{r.element}</RequireRole>, errorElement: <RouteError /> })),
      { path: '*', element: <div><PageHeader title="Page not found" /><p className="text-sm text-muted">Check the address or use the navigation.</p></div> },
    ],
  },
]);

export function App() {
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}
