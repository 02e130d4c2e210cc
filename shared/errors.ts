import { z } from 'zod';

/** Every error the API sends has this body: `{ error: { code, message, details? } }`. */
export const ERROR_CODES = [
  'VALIDATION_FAILED',
  'UNAUTHENTICATED',
  'FORBIDDEN',
  'NOT_FOUND',
  'CONFLICT',
  'PAYLOAD_TOO_LARGE',
  'UNSUPPORTED_MEDIA_TYPE',
  'RATE_LIMITED',
  'INTERNAL',
  'UNAVAILABLE',
] as const;
export const ErrorCodeSchema = z.enum(ERROR_CODES);
export type ErrorCode = z.infer<typeof ErrorCodeSchema>;

/** The HTTP status each code is sent with. */
export const ERROR_STATUS: Record<ErrorCode, number> = {
  VALIDATION_FAILED: 400,
  UNAUTHENTICATED: 401,
  FORBIDDEN: 403,
  NOT_FOUND: 404,
  CONFLICT: 409,
  PAYLOAD_TOO_LARGE: 413,
  UNSUPPORTED_MEDIA_TYPE: 415,
  RATE_LIMITED: 429,
  INTERNAL: 500,
  UNAVAILABLE: 503,
};

export const ErrorDetailSchema = z.object({ path: z.string(), message: z.string() });
export type ErrorDetail = z.infer<typeof ErrorDetailSchema>;

export const ErrorBodySchema = z.object({
  error: z.object({
    code: ErrorCodeSchema,
    message: z.string(),
    details: z.array(ErrorDetailSchema).optional(),
  }),
});
export type ErrorBody = z.infer<typeof ErrorBodySchema>;

/**
 * A write named a version that is no longer current: the 409's details say which version is, and
 * who made it when that is known. The `version` detail marks the refusal as a stale version (other
 * 409s, a duplicate key say, carry none).
 */
export interface StaleVersion {
  currentVersion: number;
  changedBy: string | null;
  changedAt: string | null;
}

export function staleVersionDetails(sentVersion: number, stale: StaleVersion): ErrorDetail[] {
  return [
    { path: 'version', message: `version ${sentVersion} is stale` },
    { path: 'currentVersion', message: String(stale.currentVersion) },
    ...(stale.changedBy ? [{ path: 'changedBy', message: stale.changedBy }] : []),
    ...(stale.changedAt ? [{ path: 'changedAt', message: stale.changedAt }] : []),
  ];
}

/** The stale version a 409's details describe, or null when they describe something else. */
export function readStaleVersion(details: readonly ErrorDetail[]): StaleVersion | null {
  const detail = (path: string) => details.find((d) => d.path === path)?.message ?? null;
  const current = Number(detail('currentVersion'));
  if (detail('version') === null || !Number.isInteger(current)) return null;
  return { currentVersion: current, changedBy: detail('changedBy'), changedAt: detail('changedAt') };
}
