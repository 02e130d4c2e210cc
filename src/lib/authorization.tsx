import type { ReactNode } from 'react';
import { queryOptions, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Navigate, redirect, useLocation } from 'react-router-dom';
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

export function useSignOut({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<void>('/auth/sign-out'),
    onSuccess: () => {
      // nothing another person may not see survives in the cache
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), null);
      onSuccess?.();
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
  if (isPending) return null;
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
