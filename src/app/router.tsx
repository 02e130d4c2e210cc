import { useMemo, type ComponentType } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, RouterProvider, type LoaderFunction } from 'react-router-dom';
import { RouteError } from '@/components/errors/route-error';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';

interface RouteModule {
  default: ComponentType;
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
}

/** Turns a route module into what a lazy route returns, binding its loader to the query client. */
const convert =
  (queryClient: QueryClient) =>
  ({ default: Component, clientLoader }: RouteModule) => ({
    Component,
    loader: clientLoader?.(queryClient),
  });

// route modules live in ./routes/**; paths the screens link to live in config/paths
const shared = { ErrorBoundary: RouteError, HydrateFallback: PageSpinner };

export function createAppRouter(queryClient: QueryClient) {
  const c = convert(queryClient);
  return createBrowserRouter([
    { path: paths.signIn.path, ...shared, lazy: () => import('./routes/auth/sign-in').then(c) },
    { path: paths.setPassword.path, ...shared, lazy: () => import('./routes/auth/set-password').then(c) },
    {
      path: paths.home.path,
      ...shared,
      lazy: () => import('./routes/app/root').then(c),
      children: [
        { index: true, ErrorBoundary: RouteError, lazy: () => import('./routes/app/home').then(c) },
        {
          path: paths.people.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/people').then(c),
        },
        {
          path: paths.mailbox.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/mailbox').then(c),
        },
        {
          path: paths.stations.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/stations').then(c),
        },
        {
          path: paths.station.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/station').then(c),
        },
        {
          path: paths.sockets.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/station-sockets').then(c),
        },
        {
          path: paths.plans.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/plans').then(c),
        },
        { path: paths.plan.path, ErrorBoundary: RouteError, lazy: () => import('./routes/app/plan').then(c) },
        {
          path: paths.walkthrough.path,
          ErrorBoundary: RouteError,
          lazy: () => import('./routes/app/walkthrough').then(c),
        },
      ],
    },
    { path: '*', lazy: () => import('./routes/not-found').then(c) },
  ]);
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createAppRouter(queryClient), [queryClient]);
  return <RouterProvider router={router} />;
}
