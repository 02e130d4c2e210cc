import zlib from 'node:zlib';
import express, { type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import type { z } from 'zod';
import { can, type Permission } from '@shared/auth/permissions';
import type { ChangeEvent } from '@shared/schemas/events';
import { HttpError } from './http-error';
import { parseInput } from '../middleware/validate';

/**
 * Who may call a route: `public` (no session), or a permission from shared/auth/permissions.ts.
 * Every route must say; there is no default, so a new route cannot be open by accident.
 */
export type Access = 'public' | Permission;

export interface InputSchemas {
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
}

type Parsed<S extends InputSchemas> = {
  body: S['body'] extends z.ZodType ? z.infer<S['body']> : undefined;
  query: S['query'] extends z.ZodType ? z.infer<S['query']> : undefined;
  params: S['params'] extends z.ZodType ? z.infer<S['params']> : undefined;
};

export interface RouteDef<S extends InputSchemas = InputSchemas> {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  access: Access;
  input?: S;
  /** middleware that runs after the access check and before validation (e.g. a multipart parser) */
  before?: RequestHandler[];
  /** returns the JSON body (status 200, or `status`) or a JsonText, or undefined after writing `res` itself */
  handler: (req: Request, res: Response, input: Parsed<S>) => unknown;
  status?: number;
  /**
   * What a write changed, for the live stream: called with the input and the handler's result once
   * the handler succeeded (null: nothing to tell).
   */
  emits?: (input: Parsed<S>, result: unknown) => ChangeEvent | null;
}

/** Where routes tell what their writes changed (the live stream's hub). */
export interface ChangeSink {
  publish(change: ChangeEvent): void;
}

/** The app's change sink, set once by createApp (`app.locals`), so every router reaches the same one. */
export function setChangeSink(app: express.Express, sink: ChangeSink) {
  app.locals.changeSink = sink;
}

/** A response body already serialised as JSON (by a worker thread, say): sent as it is. */
export class JsonText {
  constructor(readonly text: string) {}
}

export function defineRoute<S extends InputSchemas>(def: RouteDef<S>): RouteDef<S> {
  return def;
}

export interface RouteRule {
  method: string;
  path: string;
  access: Access;
}

/** Every route mounted through `mountRoutes`, with its access rule: the authorisation table. */
export const routeTable: RouteRule[] = [];

/** JSON answers from 1 kB (where `compression` starts) up to this size are gzipped on the request's thread. */
export const INLINE_GZIP_MAX_BYTES = 64 * 1024;
const INLINE_GZIP_MIN_BYTES = 1024;

/**
 * Sends a JSON text. One of a few kB (a route, a plan) is gzipped here, at the fastest level: that
 * costs less than handing it to the thread pool and waiting for it back, which `compression` does
 * for everything else (the header set here tells it the body is encoded already).
 */
function sendJsonText(req: Request, res: Response, status: number, text: string) {
  res.status(status).type('json');
  const size = Buffer.byteLength(text);
  if (
    size < INLINE_GZIP_MIN_BYTES ||
    size > INLINE_GZIP_MAX_BYTES ||
    req.acceptsEncodings('gzip', 'identity') !== 'gzip'
  )
    return res.send(text);
  res.vary('Accept-Encoding');
  res.setHeader('Content-Encoding', 'gzip');
  res.send(zlib.gzipSync(text, { level: zlib.constants.Z_BEST_SPEED }));
}

const gzipped = new WeakMap<object, Promise<Buffer>>();

/**
 * Sends a JSON text kept in a cache entry (`entry.json`, the same object for as long as the text is
 * good), gzipped once per entry on the thread pool and sent as those bytes from then on: a large
 * station's graph costs its readers no compression after the first.
 */
export async function sendCachedJson(req: Request, res: Response, entry: { json: string }) {
  res.type('json');
  if (
    Buffer.byteLength(entry.json) < INLINE_GZIP_MIN_BYTES ||
    req.acceptsEncodings('gzip', 'identity') !== 'gzip'
  )
    return void res.send(entry.json);
  let bytes = gzipped.get(entry);
  if (!bytes) {
    bytes = gzip(entry.json);
    gzipped.set(entry, bytes);
  }
  const body = await bytes;
  res.vary('Accept-Encoding');
  res.setHeader('Content-Encoding', 'gzip');
  res.send(body);
}

const gzip = (text: string) =>
  new Promise<Buffer>((resolve, reject) => zlib.gzip(text, (err, out) => (err ? reject(err) : resolve(out))));

function accessGuard(access: Access): RequestHandler {
  return (req: Request, _res: Response, next: NextFunction) => {
    if (access === 'public') return next();
    if (!req.user) return next(new HttpError('UNAUTHENTICATED', 'Sign in to continue.'));
    if (!can(req.user, access)) return next(new HttpError('FORBIDDEN', 'Your role does not allow this.'));
    next();
  };
}

// each route keeps its own input schemas; the list is heterogeneous
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function mountRoutes(base: string, defs: RouteDef<any>[]): express.Router {
  const router = express.Router();
  for (const def of defs) {
    const rule = { method: def.method.toUpperCase(), path: base + def.path, access: def.access };
    if (!routeTable.some((r) => r.method === rule.method && r.path === rule.path)) routeTable.push(rule);
    router[def.method](base + def.path, accessGuard(def.access), ...(def.before ?? []), async (req, res) => {
      const input = parseInput(def.input ?? {}, req);
      const result = await def.handler(req, res, input as never);
      const change = def.emits?.(input as never, result);
      if (change) (req.app.locals.changeSink as ChangeSink).publish(change);
      if (res.headersSent) return;
      if (result === undefined) res.status(def.status ?? 204).end();
      else
        sendJsonText(
          req,
          res,
          def.status ?? 200,
          result instanceof JsonText ? result.text : JSON.stringify(result),
        );
    });
  }
  return router;
}
