import {
  ErrorBodySchema,
  readStaleVersion,
  type ErrorCode,
  type ErrorDetail,
  type StaleVersion,
} from '@shared/errors';
import { paths } from '@/config/paths';

export type ApiErrorCode = ErrorCode | 'NETWORK';

export class ApiError extends Error {
  override name = 'ApiError';
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly details: ErrorDetail[] = [],
  ) {
    super(message);
  }
}

export function isApiError(value: unknown): value is ApiError {
  return value instanceof ApiError;
}

/** A refusal because someone saved first (409 with the current version), or null for any other error. */
export function staleVersionOf(error: unknown): StaleVersion | null {
  return isApiError(error) && error.status === 409 ? readStaleVersion(error.details) : null;
}

const API_BASE = '/api';
// a 401 from these is an answer ("not signed in", "wrong password"), not an expired session
const ANSWERS_WITH_401 = ['/auth/me', '/auth/sign-in'];

let onUnauthenticated = (redirectTo: string) => {
  window.location.assign(paths.signIn.getHref(redirectTo));
};

/** Lets tests observe the sign-in redirect without navigating jsdom. */
export function setUnauthenticatedHandler(handler: (redirectTo: string) => void) {
  onUnauthenticated = handler;
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  body?: unknown;
  signal?: AbortSignal;
  /** the request outlives the page (a save sent as the page is left); bodies up to 64 KiB */
  keepalive?: boolean;
}

async function toApiError(response: Response): Promise<ApiError> {
  const text = await response.text().catch(() => '');
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  const parsed = ErrorBodySchema.safeParse(json);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(response.status, code, message, details);
  }
  const fallbackCode: ErrorCode = response.status === 404 ? 'NOT_FOUND' : 'INTERNAL';
  return new ApiError(
    response.status,
    fallbackCode,
    `The server answered ${response.status}${response.statusText ? ` ${response.statusText}` : ''}.`,
  );
}

export async function request<T>(method: Method, path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  let body: BodyInit | undefined;
  if (options.body instanceof FormData) {
    body = options.body;
  } else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(options.body);
  }

  let response: Response;
  try {
    response = await fetch(`${API_BASE}${path}`, {
      method,
      headers,
      body,
      credentials: 'same-origin',
      signal: options.signal,
      ...(options.keepalive ? { keepalive: true } : {}),
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(
      0,
      'NETWORK',
      'Could not reach the Tetherwise server. Check your connection and retry.',
    );
  }

  if (!response.ok) {
    const error = await toApiError(response);
    if (response.status === 401 && !ANSWERS_WITH_401.includes(path)) {
      onUnauthenticated(`${window.location.pathname}${window.location.search}`);
    }
    throw error;
  }
  if (response.status === 204) return undefined as T;
  const text = await response.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

export const api = {
  get: <T>(path: string, options?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('PATCH', path, { ...options, body }),
  delete: <T>(path: string, options?: RequestOptions) => request<T>('DELETE', path, options),
};

/** What to tell the user about a failed request: the server's message, or the fallback. */
export function apiErrorMessage(error: unknown, fallback: string): string | null {
  if (!error) return null;
  return isApiError(error) ? error.message : fallback;
}
