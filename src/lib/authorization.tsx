import type { ReactNode } from 'react';
import { queryOptions, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Navigate, redirect, useLocation, useNavigate } from 'react-router-dom';
import { can, type Permission } from '@shared/auth/permissions';
import type { User } from '@shared/schemas/auth';
import { paths } from '@/config/paths';
import { api, ApiError, isApiError } from './api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
};

export async function getUser(): Promise<User | null> {
  try {
    const { user } = await api.get<{ user: User }>('/auth/me');
    return user;
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const userQueryOptions = () =>
  queryOptions({ queryKey: authKeys.me(), queryFn: getUser, staleTime: 5 * 60_000 });

export function useUser() {
  return useQuery(userQueryOptions());
}

export function useCan(permission: Permission): boolean {
  const { data: user } = useUser();
  return can(user, permission);
}

export function setSignedInUser(queryClient: QueryClient, user: User) {
  queryClient.setQueryData(authKeys.me(), user);
}

/**
 * Empties the cache of what the signed-out session read: each query once nothing on screen reads it
 * (a query emptied under a mounted page would be fetched again at its next render), so those of the
 * page being left go as it unmounts. Ends at once if someone signs in meanwhile.
 */
function forgetSession(queryClient: QueryClient) {
  const cache = queryClient.getQueryCache();
  const left = () => cache.findAll({ predicate: (query) => query.queryKey[0] !== authKeys.all[0] });
  const drop = () => {
    for (const query of left()) if (query.getObserversCount() === 0) cache.remove(query);
    return left().length === 0;
  };
  if (drop()) return;
  const stop = cache.subscribe((event) => {
    if (queryClient.getQueryData(authKeys.me())) stop();
    else if (event.type === 'observerRemoved' && drop()) stop();
  });
}

/** Query clients whose person is signing out: between the end of the session and the sign-in page. */
const signingOut = new WeakSet<QueryClient>();

/**
 * Signs out, leaves for the sign-in page, then empties the cache. In that order, and the page left
 * before the cache goes (the navigation committed at once): a query emptied under a page still on
 * screen is fetched again at its next render, and refused, since the session has ended.
 */
export function useSignOut() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  return useMutation({
    mutationFn: () => api.post<void>('/auth/sign-out'),
    onSuccess: async () => {
      await queryClient.cancelQueries();
      signingOut.add(queryClient);
      try {
        queryClient.setQueryData(authKeys.me(), null);
        await navigate(paths.signIn.getHref(), { replace: true, flushSync: true });
      } finally {
        signingOut.delete(queryClient);
      }
      // nothing another person may not see survives in the cache
      forgetSession(queryClient);
      queryClient.getMutationCache().clear();
    },
  });
}

/** Route loader guard: the signed-in user, or a redirect to sign-in that comes back here. */
export async function requireUser(queryClient: QueryClient, request: Request): Promise<User> {
  const user = await queryClient.ensureQueryData(userQueryOptions());
  if (!user) {
    const url = new URL(request.url);
    throw redirect(paths.signIn.getHref(`${url.pathname}${url.search}`));
  }
  return user;
}

/** Route loader guard for a permission; the route's error boundary explains a refusal. */
export async function requirePermission(
  queryClient: QueryClient,
  request: Request,
  permission: Permission,
): Promise<User> {
  const user = await requireUser(queryClient, request);
  if (!can(user, permission)) {
    throw new ApiError(403, 'FORBIDDEN', 'Your role does not give access to this page.');
  }
  return user;
}

/** Keeps signed-out people out of the app even when the session ends while a page is open. */
export function ProtectedRoute({ children }: { children: ReactNode }) {
  const { data: user, isPending } = useUser();
  const location = useLocation();
  const queryClient = useQueryClient();
  if (isPending) return null;
  // signing out leaves for the plain sign-in page itself, with the page kept on screen until then
  // (read as it renders: a subscription's news could come after the user's)
  if (!user && signingOut.has(queryClient)) return <>{children}</>;
  if (!user) return <Navigate to={paths.signIn.getHref(`${location.pathname}${location.search}`)} replace />;
  return <>{children}</>;
}

interface AuthorizationProps {
  permission: Permission;
  forbiddenFallback?: ReactNode;
  children: ReactNode;
}

export function Authorization({ permission, forbiddenFallback = null, children }: AuthorizationProps) {
  return <>{useCan(permission) ? children : forbiddenFallback}</>;
}
