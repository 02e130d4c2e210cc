import { Worker } from 'node:worker_threads';
import type { CompiledStation } from '@shared/compute/compiled-station';
import { adoptClipGraph, type ClipGraphParts } from '@shared/compute/routes-clip';
import {
  CLIP_BUILD_FREE_NODES,
  findRoute,
  wantsClipGraph,
  type FindRouteOptions,
} from '@shared/compute/routes';
import type { RouteMatrix, RouteMatrixRequest, RouteRequest, RouteResult } from '@shared/schemas/route';
import { routeMatrix } from '@shared/compute/route-matrix';
import type { StationDocument } from '@shared/schemas/station';
import type { Logger } from '../../lib/logger';

const BOOT = new URL('./ts-worker-boot.mjs', import.meta.url);

/** What a builder thread is given. */
export interface ClipBuildJob {
  doc: StationDocument;
  tetherLengthM: number;
  excludeMask: number;
}

export interface ClipBuildEvent {
  nodes: number;
  tetherLengthM: number;
  excludeMask: number;
  ok: boolean;
  ms: number;
  error?: string;
}

interface Builds {
  /** `auto` builds a clip graph within the query up to this many nodes; above, a builder thread does */
  inlineNodes: number;
  running: Map<Worker, Promise<void>>;
  onEvent: (e: ClipBuildEvent) => void;
  /** builds this thread started that handed their clip graph over, and that did not */
  built: number;
  failed: number;
}

const builds: Builds = {
  inlineNodes: CLIP_BUILD_FREE_NODES,
  running: new Map(),
  onEvent: () => {},
  built: 0,
  failed: 0,
};

/** This thread's builds off the request path: running now, finished with a clip graph, failed. */
export function clipBuildCounts(): { running: number; built: number; failed: number } {
  return { running: builds.running.size, built: builds.built, failed: builds.failed };
}

/** Sets the size above which clip graphs are built off the request path, and who hears of builds. */
export function configureClipBuilds(options: {
  inlineNodes?: number;
  onEvent?: (e: ClipBuildEvent) => void;
}): void {
  if (options.inlineNodes !== undefined) builds.inlineNodes = options.inlineNodes;
  if (options.onEvent) builds.onEvent = options.onEvent;
}

// the clip graphs being built for each compiled station, by `<tether>|<mask>`
const pending = new WeakMap<CompiledStation, Set<string>>();

/**
 * A route as findRoute answers it, and on a station too large to build a clip graph during a query,
 * a builder thread started for the one this request would use (one at a time in the process; a
 * request while one runs starts none). The query is answered at once by the label search; once
 * the builder hands its clip graph over, the next queries use it. Both searches are exact: the
 * answer has the same cost either way, though of two equally good routes they may pick different ones.
 */
export function routeOffPath(
  compiled: CompiledStation,
  doc: StationDocument,
  request: RouteRequest,
): RouteResult {
  buildFor(compiled, doc, request);
  return findRoute(compiled, doc.settings, request, { clipBuildFreeNodes: builds.inlineNodes });
}

/**
 * Before any query: the clip graph most plans' days on this station search (the station's tether,
 * arm rides not allowed), built in a builder thread when the station is too large to build it
 * during a query and this thread has none. Whether a build started (not when one is running).
 */
export function warmClipGraph(compiled: CompiledStation, doc: StationDocument): boolean {
  return buildFor(compiled, doc, { from: '', to: '', mode: 'balanced' });
}

/** Starts a builder thread for the clip graph `request` would use, when `auto` lacks it and none runs. */
function buildFor(compiled: CompiledStation, doc: StationDocument, request: RouteRequest): boolean {
  const options: FindRouteOptions = { clipBuildFreeNodes: builds.inlineNodes };
  const want = wantsClipGraph(compiled, doc.settings, request, options);
  // a clip graph is filed under the compiled station's own arc times: other settings get none
  if (!want || want.weights !== compiled.arcSeconds || builds.running.size > 0) return false;
  const key = `${want.tetherLengthM}|${want.excludeMask}`;
  let keys = pending.get(compiled);
  if (!keys) pending.set(compiled, (keys = new Set()));
  if (keys.has(key)) return false;
  keys.add(key);
  startBuild(compiled, { doc, tetherLengthM: want.tetherLengthM, excludeMask: want.excludeMask }, () =>
    keys.delete(key),
  );
  return true;
}

function startBuild(compiled: CompiledStation, job: ClipBuildJob, done: () => void): void {
  const started = performance.now();
  const worker = new Worker(BOOT, { argv: ['./clip-builder-worker.ts'], workerData: job });
  // a build never keeps the process alive: shutting down simply drops it
  worker.unref();
  const finished = new Promise<void>((resolve) => {
    let settled = false;
    const finish = (ok: boolean, error?: string) => {
      if (settled) return;
      settled = true;
      builds.running.delete(worker);
      if (ok) builds.built++;
      else builds.failed++;
      done();
      resolve();
      const event = {
        nodes: compiled.nodeCount,
        tetherLengthM: job.tetherLengthM,
        excludeMask: job.excludeMask,
        ok,
      };
      builds.onEvent({ ...event, ms: performance.now() - started, ...(error ? { error } : {}) });
    };
    worker.on('message', (parts: ClipGraphParts) => {
      adoptClipGraph(compiled.arcSeconds, parts);
      finish(true);
    });
    worker.on('error', (err) => finish(false, err.message));
    worker.on('exit', (code) =>
      finish(false, `the builder stopped (code ${code}) before handing over a clip graph`),
    );
  });
  builds.running.set(worker, finished);
}

/** One log line for a finished build (from this thread, or from route worker `worker`). */
export function logClipBuild(logger: Logger, e: ClipBuildEvent, worker?: number): void {
  const fields = { ...e, ms: Math.round(e.ms), ...(worker !== undefined ? { worker } : {}) };
  if (e.ok) logger.info(fields, 'clip graph built off the request path');
  else logger.warn(fields, 'clip graph build did not finish; routes on this station use the label search');
}

/** Stops every builder thread and waits for them to end. */
export async function stopClipBuilds(): Promise<void> {
  const running = [...builds.running];
  for (const [worker] of running) void worker.terminate();
  await Promise.all(running.map(([, exited]) => exited));
}

/** Resolves when no builder thread is running (for tests and benchmarks). */
export async function clipBuildsSettled(): Promise<void> {
  while (builds.running.size > 0) await Promise.all([...builds.running.values()]);
}

/** Every route between `request.nodes`, each as `routeOffPath` answers it (a route worker, or the main thread). */
export function routeMatrixOn(
  entry: { compiled: CompiledStation; doc: StationDocument },
  request: RouteMatrixRequest,
): RouteMatrix {
  return routeMatrix(request, (r) => routeOffPath(entry.compiled, entry.doc, r));
}
