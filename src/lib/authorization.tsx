import type { ReactNode } from 'react';
import {
  queryOptions,
  useIsMutating,
  useMutation,
  useQuery,
  useQueryClient,
  type QueryClient,
} from '@tanstack/react-query';
import { Navigate, redirect, useLocation, useNavigate } from 'react-router-dom';
import { can, type Permission } from '@shared/auth/permissions';
import type { User } from '@shared/schemas/auth';
import { paths } from '@/config/paths';
import { api, ApiError, isApiError } from './api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
  signOut: () => [...authKeys.all, 'sign-out'] as const,
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
 * Signs out, leaves for the sign-in page, then empties the cache. In that order, and the page left
 * before the cache goes (the navigation committed at once): a query emptied under a page still on
 * screen is fetched again at its next render, and refused, since the session has ended.
 */
export function useSignOut() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  return useMutation({
    mutationKey: authKeys.signOut(),
    mutationFn: () => api.post<void>('/auth/sign-out'),
    onSuccess: async () => {
      await queryClient.cancelQueries();
      queryClient.setQueryData(authKeys.me(), null);
      await navigate(paths.signIn.getHref(), { replace: true, flushSync: true });
      // nothing another person may not see survives in the cache
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== authKeys.all[0] });
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
  // signing out leaves for the plain sign-in page itself, with the page kept on screen until then
  const signingOut = useIsMutating({ mutationKey: authKeys.signOut() }) > 0;
  if (isPending) return null;
  if (!user && signingOut) return <>{children}</>;
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
