import type { QueryClient } from '@tanstack/react-query';
import { Outlet, type LoaderFunctionArgs } from 'react-router-dom';
import { AppLayout } from '@/components/layouts/app-layout';
import { ProtectedRoute, requireUser } from '@/lib/authorization';
import { LiveUpdates } from '@/features/live/live-updates';
import { staleKeysOf } from '../../live-keys';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    return null;
  };

export default function AppRoot() {
  return (
    <ProtectedRoute>
      <LiveUpdates staleKeysOf={staleKeysOf}>
        <AppLayout>
          <Outlet />
        </AppLayout>
      </LiveUpdates>
    </ProtectedRoute>
  );
}
