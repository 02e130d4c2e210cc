import { act } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { authKeys } from '@/lib/authorization';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { render, typeInto, until, type Rendered } from './render';

let rendered: Rendered | undefined;
afterEach(() => {
  rendered?.unmount();
  vi.unstubAllGlobals();
});

function field(container: HTMLElement, label: string): HTMLInputElement {
  const labelEl = [...container.querySelectorAll('label')].find((l) => l.textContent === label);
  const input = labelEl && container.ownerDocument.getElementById(labelEl.htmlFor);
  if (!(input instanceof HTMLInputElement)) throw new Error(`no input labelled ${label}`);
  return input;
}

async function submit(container: HTMLElement) {
  const button = [...container.querySelectorAll('button')].find((b) => b.textContent === 'Sign in');
  if (!button) throw new Error('no Sign in button');
  await act(async () => button.click());
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
    rendered = await render(<SignInForm onSuccess={onSuccess} />);
    const { container, queryClient } = rendered;

    await typeInto(field(container, 'E-mail'), '  Planner@Example.org ');
    await typeInto(field(container, 'Password'), 'nope');
    await submit(container);

    const alert = await until(() => container.querySelector('[role="alert"]'));
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
    rendered = await render(<SignInForm onSuccess={vi.fn()} />);
    const { container } = rendered;
    await typeInto(field(container, 'E-mail'), 'not-an-address');
    await submit(container);
    await until(() => container.querySelector('[aria-invalid="true"]'));
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
    rendered = await render(<SignInForm onSuccess={onSuccess} />);
    const { container, queryClient } = rendered;
    await typeInto(field(container, 'E-mail'), user.email);
    await typeInto(field(container, 'Password'), 'tetherwise-demo');
    await submit(container);
    await until(() => onSuccess.mock.calls.length > 0);
    expect(onSuccess).toHaveBeenCalledWith(user);
    expect(queryClient.getQueryData(authKeys.me())).toEqual(user);
  });
});
