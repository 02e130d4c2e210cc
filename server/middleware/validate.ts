import type { Request } from 'express';
import { z } from 'zod';
import { formatIssuePath } from '@shared/schemas/station';
import { HttpError } from '../lib/http-error';
import type { InputSchemas } from '../lib/route';

/** Turns zod issues into the error body's details, each path prefixed with where it came from. */
export function zodDetails(error: z.ZodError, where: string) {
  return error.issues.map((i) => ({
    path: i.path.length ? `${where}.${formatIssuePath(i.path)}` : where,
    message: i.message,
  }));
}

/** Parses body, query and params with their schemas; any failure is one 400 naming every problem. */
export function parseInput(schemas: InputSchemas, req: Request) {
  const out: Record<string, unknown> = { body: undefined, query: undefined, params: undefined };
  const details: { path: string; message: string }[] = [];
  for (const where of ['params', 'query', 'body'] as const) {
    const schema = schemas[where];
    if (!schema) continue;
    const raw = where === 'body' ? (req.body ?? {}) : req[where];
    const parsed = schema.safeParse(raw);
    if (parsed.success) out[where] = parsed.data;
    else details.push(...zodDetails(parsed.error, where));
  }
  if (details.length) {
    throw new HttpError(
      'VALIDATION_FAILED',
      `The request is not valid: ${details[0].path} ${details[0].message}`,
      details,
    );
  }
  return out;
}
