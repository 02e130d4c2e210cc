import { afterEach, describe, expect, it, vi } from 'vitest';
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useQuery } from '@tanstack/react-query';
import { createMemoryRouter, redirect, RouterProvider } from 'react-router-dom';
import { paths } from '@/config/paths';
import { authKeys, ProtectedRoute, userQueryOptions, useSignOut, useUser } from '@/lib/authorization';
import { createQueryClient } from '@/lib/query-client';
import { renderWithQueryClient } from '../setup/client';

/** A signed-in page that reads the user (as pages do for their permissions) and one query of its own. */
function Page({ fetched }: { fetched: () => void }) {
  const { data: user } = useUser();
  const signOut = useSignOut();
  const { data } = useQuery({
    queryKey: ['graph'],
    queryFn: () => {
      fetched();
      return 'the graph';
    },
  });
  return (
    <main>
      <p>{user ? `signed in as ${user.email}` : 'nobody'}</p>
      <p>{data}</p>
      <button type="button" onClick={() => signOut.mutate()}>
        Sign out
      </button>
    </main>
  );
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('signing out from a page', () => {
  it('leaves the page before the cache goes, so nothing on it is fetched again signed out', async () => {
    const requests: string[] = [];
    vi.stubGlobal(
      'fetch',
      vi.fn((url: string) => {
        requests.push(String(url));
        return Promise.resolve(new Response(null, { status: 204 }));
      }),
    );
    const queryClient = createQueryClient();
    queryClient.setQueryData(authKeys.me(), {
      id: 1,
      email: 'planner@example.org',
      name: 'Planner',
      role: 'planner',
    });
    const fetched = vi.fn();
    const router = createMemoryRouter(
      [
        {
          path: paths.signIn.path,
          element: <h1>Sign in</h1>,
          // as the app's sign-in route: sends a signed-in visitor on, and is loaded lazily (a while)
          loader: async () => {
            if (await queryClient.ensureQueryData(userQueryOptions())) throw redirect('/');
            await new Promise((resolve) => setTimeout(resolve, 20));
            return null;
          },
        },
        {
          path: '/stations/1',
          element: (
            <ProtectedRoute>
              <Page fetched={fetched} />
            </ProtectedRoute>
          ),
        },
      ],
      { initialEntries: ['/stations/1'] },
    );
    renderWithQueryClient(<RouterProvider router={router} />, queryClient);
    await screen.findByText('the graph', {}, { timeout: 8000 });
    expect(fetched).toHaveBeenCalledTimes(1);

    await userEvent.click(screen.getByRole('button', { name: 'Sign out' }));
    await screen.findByRole('heading', { name: 'Sign in' }, { timeout: 8000 });
    // the plain sign-in page, not one that would bring the next person back to this page
    expect(router.state.location.pathname).toBe(paths.signIn.getHref());
    expect(router.state.location.search).toBe('');
    // nothing the signed-in person saw stays in the cache; the cache knows nobody is signed in
    await waitFor(() => expect(queryClient.getQueryData(['graph'])).toBeUndefined(), { timeout: 8000 });
    expect(queryClient.getQueryData(authKeys.me())).toBeNull();
    expect(fetched).toHaveBeenCalledTimes(1);
    expect(requests).toEqual(['/api/auth/sign-out']);
  });
});
