import type { ErrorCode, ErrorDetail } from '@shared/errors';
import { HttpError } from '../../lib/http-error';
import type { StationChange } from '../stations/stations.service';

/** Main thread → task worker: run one task. */
export interface TaskMessage {
  id: number;
  kind: string;
  input: unknown;
}

/** An error thrown by a task, as it crosses the thread boundary. */
export type TaskError =
  | {
      http: true;
      code: ErrorCode;
      message: string;
      details?: ErrorDetail[];
      headers?: Record<string, string>;
    }
  | { http: false; name: string; message: string; stack?: string };

/** Task worker → main thread. */
export type TaskReply =
  | { kind: 'ready' }
  /** a task committed a station write: the main thread tells its own listeners */
  | { kind: 'station-changed'; change: StationChange }
  | { kind: 'result'; id: number; result: unknown }
  | { kind: 'error'; id: number; error: TaskError };

export function toTaskError(err: unknown): TaskError {
  if (err instanceof HttpError)
    return { http: true, code: err.code, message: err.message, details: err.details, headers: err.headers };
  const e = err instanceof Error ? err : new Error(String(err));
  return { http: false, name: e.name, message: e.message, stack: e.stack };
}

/** The error as the main thread throws it: an HttpError stays one (its 4xx is sent), anything else is a 500. */
export function fromTaskError(e: TaskError): Error {
  if (e.http) return new HttpError(e.code, e.message, e.details, e.headers);
  const err = new Error(e.message);
  err.name = e.name;
  if (e.stack) err.stack = e.stack;
  return err;
}
