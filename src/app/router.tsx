import { useMemo, type ComponentType } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { createBrowserRouter, RouterProvider, type LoaderFunction, type RouteObject } from 'react-router-dom';
import { RouteError } from '@/components/errors/route-error';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';

interface RouteModule {
  default: ComponentType;
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
}

export function createAppRouter(queryClient: QueryClient) {
  /** A lazily loaded route whose module's loader is bound to the query client; every route has its own error boundary. */
  const route = (
    path: string | undefined,
    load: () => Promise<RouteModule>,
    extra: Partial<RouteObject> = {},
  ) =>
    ({
      ...(path === undefined ? { index: true } : { path }),
      ErrorBoundary: RouteError,
      ...extra,
      lazy: () =>
        load().then(({ default: Component, clientLoader }) => ({
          Component,
          loader: clientLoader?.(queryClient),
        })),
    }) as RouteObject;
  const top = { HydrateFallback: PageSpinner };
  /** screens built round the 3D view (and the plan, the day beside its tasks) take the window's whole width */
  const workspace = { handle: { workspace: true } };

  return createBrowserRouter([
    route(paths.signIn.path, () => import('./routes/auth/sign-in'), top),
    route(paths.setPassword.path, () => import('./routes/auth/set-password'), top),
    route(paths.home.path, () => import('./routes/app/root'), {
      ...top,
      children: [
        route(undefined, () => import('./routes/app/home')),
        route(paths.people.path, () => import('./routes/app/people')),
        route(paths.mailbox.path, () => import('./routes/app/mailbox')),
        route(paths.stations.path, () => import('./routes/app/stations')),
        route(paths.station.path, () => import('./routes/app/station'), workspace),
        route(paths.sockets.path, () => import('./routes/app/station-sockets'), workspace),
        route(paths.plans.path, () => import('./routes/app/plans')),
        route(paths.plan.path, () => import('./routes/app/plan'), workspace),
        route(paths.run.path, () => import('./routes/app/run'), workspace),
        route(paths.series.path, () => import('./routes/app/series')),
        route(paths.walkthroughs.path, () => import('./routes/app/walkthroughs')),
        route(paths.walkthrough.path, () => import('./routes/app/walkthrough'), workspace),
      ],
    }),
    route('*', () => import('./routes/not-found'), top),
  ]);
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createAppRouter(queryClient), [queryClient]);
  return <RouterProvider router={router} />;
}
