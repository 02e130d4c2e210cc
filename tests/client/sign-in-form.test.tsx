import { afterEach, describe, expect, it, vi } from 'vitest';
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { authKeys } from '@/lib/authorization';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { renderWithQueryClient } from '../setup/client';

afterEach(() => vi.unstubAllGlobals());

/** Types the address and password (when given) the way a person does, then presses Sign in. */
async function signIn(email: string, password?: string) {
  const user = userEvent.setup();
  await user.type(screen.getByLabelText('E-mail'), email);
  if (password !== undefined) await user.type(screen.getByLabelText('Password'), password);
  await user.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('SignInForm', () => {
  it('shows the server’s message in an alert and keeps the user signed out', async () => {
    const fetch = vi.fn(async () =>
      Response.json(
        { error: { code: 'UNAUTHENTICATED', message: 'Wrong e-mail or password.' } },
        { status: 401 },
      ),
    );
    vi.stubGlobal('fetch', fetch);
    const onSuccess = vi.fn();
    const { queryClient } = renderWithQueryClient(<SignInForm onSuccess={onSuccess} />);

    await signIn('  Planner@Example.org ', 'nope');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toBe('Wrong e-mail or password.');
    expect(alert.closest('[aria-live]')).not.toBeNull();
    expect(onSuccess).not.toHaveBeenCalled();
    expect(queryClient.getQueryData(authKeys.me())).toBeUndefined();
    // the same schema as the server trims and lower-cases the address before sending it
    const [, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(JSON.parse(String(init.body))).toEqual({
      email: 'planner@example.org',
      password: 'nope',
    });
  });

  it('does not send an invalid form and marks the fields', async () => {
    const fetch = vi.fn();
    vi.stubGlobal('fetch', fetch);
    const { container } = renderWithQueryClient(<SignInForm onSuccess={vi.fn()} />);
    await signIn('not-an-address');
    await waitFor(() => expect(screen.getByLabelText('E-mail').getAttribute('aria-invalid')).toBe('true'));
    expect(container.textContent).toContain('enter a valid e-mail address');
    expect(container.textContent).toContain('enter your password');
    expect(fetch).not.toHaveBeenCalled();
  });

  it('stores the signed-in user and reports success', async () => {
    const user = { id: 2, email: 'planner@example.org', name: 'Priya', role: 'planner' };
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Response.json({ user })),
    );
    const onSuccess = vi.fn();
    const { queryClient } = renderWithQueryClient(<SignInForm onSuccess={onSuccess} />);
    await signIn(user.email, 'tetherwise-demo');
    await waitFor(() => expect(onSuccess).toHaveBeenCalledWith(user));
    expect(queryClient.getQueryData(authKeys.me())).toEqual(user);
  });
});
