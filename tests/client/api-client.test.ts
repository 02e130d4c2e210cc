import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { api, ApiError, apiErrorMessage, setUnauthenticatedHandler } from '@/lib/api-client';

type FetchArgs = [string, RequestInit];

function respond(status: number, body?: unknown, contentType = 'application/json') {
  const text = body === undefined ? '' : typeof body === 'string' ? body : JSON.stringify(body);
  return vi.fn(
    async (..._args: FetchArgs) =>
      new Response(status === 204 ? null : text, {
        status,
        headers: { 'Content-Type': contentType },
      }),
  );
}

let redirects: string[];

beforeEach(() => {
  redirects = [];
  setUnauthenticatedHandler((to) => redirects.push(to));
  window.history.replaceState(null, '', '/plans/7?tab=timeline');
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('api client', () => {
  it('sends JSON with the session cookie of this origin and parses the answer', async () => {
    const fetch = respond(201, { user: { id: 9 } });
    vi.stubGlobal('fetch', fetch);
    await expect(api.post('/users/invite', { email: 'a@example.org' })).resolves.toEqual({ user: { id: 9 } });
    const [url, init] = fetch.mock.calls[0];
    expect(url).toBe('/api/users/invite');
    expect(init.method).toBe('POST');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"email":"a@example.org"}');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('returns undefined for 204 No Content', async () => {
    vi.stubGlobal('fetch', respond(204));
    await expect(api.delete('/mailbox')).resolves.toBeUndefined();
  });

  it('turns an error body into an ApiError with code, status, message and details', async () => {
    const details = [{ path: 'email', message: 'enter a valid e-mail address' }];
    vi.stubGlobal(
      'fetch',
      respond(400, { error: { code: 'VALIDATION_FAILED', message: 'Check the form.', details } }),
    );
    const error = await api.post('/users/invite', {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({
      status: 400,
      code: 'VALIDATION_FAILED',
      message: 'Check the form.',
      details,
    });
    expect(apiErrorMessage(error, 'fallback')).toBe('Check the form.');
  });

  it('describes a response that is not an error body by its status', async () => {
    vi.stubGlobal('fetch', respond(502, '<html>Bad gateway</html>', 'text/html'));
    const error = (await api.get('/health').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('INTERNAL');
    expect(error.status).toBe(502);
    expect(error.message).toContain('502');
  });

  it('reports an unreachable server as a network error', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    );
    const error = (await api.get('/users').catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('NETWORK');
    expect(error.status).toBe(0);
  });

  it('sends an expired session to sign-in, coming back to the page it was on', async () => {
    vi.stubGlobal('fetch', respond(401, { error: { code: 'UNAUTHENTICATED', message: 'Sign in again.' } }));
    await expect(api.get('/users')).rejects.toMatchObject({ status: 401 });
    expect(redirects).toEqual(['/plans/7?tab=timeline']);
  });

  it('treats 401 from /auth/me and /auth/sign-in as answers, not as an expired session', async () => {
    vi.stubGlobal(
      'fetch',
      respond(401, { error: { code: 'UNAUTHENTICATED', message: 'Wrong e-mail or password.' } }),
    );
    await expect(api.get('/auth/me')).rejects.toMatchObject({ status: 401 });
    await expect(api.post('/auth/sign-in', {})).rejects.toMatchObject({
      message: 'Wrong e-mail or password.',
    });
    expect(redirects).toEqual([]);
  });
});
