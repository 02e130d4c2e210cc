import type { CompiledStation } from '@shared/compute/compiled-station';
import type { DayRouteRequest } from '@shared/compute/day/types';
import type { RouteResult } from '@shared/schemas/route';

/**
 * What one thread (each route worker, and the main thread) keeps of the days it computed: the routes
 * of their legs, and the last few whole timelines. Both are keyed by the compiled station they were
 * computed on, which is one station version on this thread (a new version is compiled afresh, so its
 * keys are new and nothing of an older version is ever served for it), and by their exact inputs.
 * Cached answers are shared, never copied: nothing that reads them may change them.
 */

/** Routes kept per thread at the most (with ROUTE_MEMO_BYTES: whichever is reached first). */
export const ROUTE_MEMO_ENTRIES = 20_000;
/** Estimated bytes of the routes kept per thread at the most. */
export const ROUTE_MEMO_BYTES = 64 * 2 ** 20;
/** Whole timelines kept per thread at the most. */
export const TIMELINE_MEMO_ENTRIES = 4;

export interface DayCacheStats {
  routes: { entries: number; bytes: number; budgetBytes: number; hits: number; misses: number };
  timelines: { entries: number; hits: number; misses: number };
}

// one number per compiled station on this thread: a key never outlives its station version's identity
const stationIds = new WeakMap<CompiledStation, number>();
let nextStationId = 1;
const idOf = (compiled: CompiledStation) => {
  let id = stationIds.get(compiled);
  if (id === undefined) stationIds.set(compiled, (id = nextStationId++));
  return id;
};

/** A least-recently-used map bounded by entries and by the sizes its caller estimates. */
export class BoundedMemo<V> {
  private readonly entries = new Map<string, { value: V; bytes: number }>();
  private bytes = 0;
  hits = 0;
  misses = 0;

  constructor(
    private maxEntries: number,
    private maxBytes: number,
  ) {}

  get(key: string): V | undefined {
    const hit = this.entries.get(key);
    if (!hit) {
      this.misses++;
      return undefined;
    }
    this.hits++;
    this.entries.delete(key);
    this.entries.set(key, hit);
    return hit.value;
  }

  set(key: string, value: V, bytes: number): void {
    this.delete(key);
    this.entries.set(key, { value, bytes });
    this.bytes += bytes;
    // the newest always stays, however large
    while (this.entries.size > 1 && (this.entries.size > this.maxEntries || this.bytes > this.maxBytes))
      this.delete(this.entries.keys().next().value!);
  }

  /** Drops every entry whose key starts with `prefix`. */
  forget(prefix: string): void {
    for (const key of [...this.entries.keys()]) if (key.startsWith(prefix)) this.delete(key);
  }

  resize(maxEntries: number, maxBytes: number): void {
    this.maxEntries = maxEntries;
    this.maxBytes = maxBytes;
    while (this.entries.size > 0 && (this.entries.size > maxEntries || this.bytes > maxBytes))
      this.delete(this.entries.keys().next().value!);
  }

  clear(): void {
    this.entries.clear();
    this.bytes = 0;
    this.hits = 0;
    this.misses = 0;
  }

  stats() {
    return { entries: this.entries.size, bytes: this.bytes, budgetBytes: this.maxBytes };
  }

  private delete(key: string) {
    const old = this.entries.get(key);
    if (!old) return;
    this.entries.delete(key);
    this.bytes -= old.bytes;
  }
}

const routes = new BoundedMemo<RouteResult>(ROUTE_MEMO_ENTRIES, ROUTE_MEMO_BYTES);
const timelines = new BoundedMemo<unknown>(TIMELINE_MEMO_ENTRIES, Infinity);

/** Every field of the request, in a fixed order: two requests with the same key get the same route. */
const requestKey = (request: DayRouteRequest) =>
  JSON.stringify(
    Object.entries(request)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)),
  );

/** A route's size in memory, roughly: its arrays' items and the key it is kept under. */
function routeBytes(route: RouteResult, key: string): number {
  if (!route.feasible) return 200 + key.length * 2;
  return 400 + key.length * 2 + route.nodes.length * 16 + route.legs.length * 120 + route.swaps.length * 80;
}

/**
 * `engine`'s answer to `request` on `compiled`, asked once per distinct request while it is kept:
 * the day's legs repeat across its timeline, its exports, the series that reads it and a preview.
 */
export function rememberedRoute(
  compiled: CompiledStation,
  request: DayRouteRequest,
  engine: (request: DayRouteRequest) => RouteResult,
): RouteResult {
  const key = `${idOf(compiled)}|${requestKey(request)}`;
  let route = routes.get(key);
  if (!route) {
    route = engine(request);
    routes.set(key, route, routeBytes(route, key));
  }
  return route;
}

/**
 * `compute()`'s timeline for these exact inputs on `compiled`, computed once while it is kept (the
 * CSV or PDF asked right after the timeline costs only its formatting). `inputs` is everything the
 * timeline depends on beside the station: the plan as given (its version and every field), the start
 * and what the server adds.
 */
export function rememberedTimeline<T>(compiled: CompiledStation, inputs: unknown, compute: () => T): T {
  const key = `${idOf(compiled)}|${JSON.stringify(inputs)}`;
  const hit = timelines.get(key) as T | undefined;
  if (hit !== undefined) return hit;
  const timeline = compute();
  timelines.set(key, timeline, 0);
  return timeline;
}

/** Drops what was kept of a compiled station this thread no longer holds. */
export function forgetStation(compiled: CompiledStation): void {
  const id = stationIds.get(compiled);
  if (id === undefined) return;
  routes.forget(`${id}|`);
  timelines.forget(`${id}|`);
}

/** Bounds of this thread's route memo (tests use small ones). */
export function setRouteMemoBounds(maxEntries = ROUTE_MEMO_ENTRIES, maxBytes = ROUTE_MEMO_BYTES): void {
  routes.resize(maxEntries, maxBytes);
}

/** Empties this thread's caches and their counts. */
export function clearDayCache(): void {
  routes.clear();
  timelines.clear();
}

export function dayCacheStats(): DayCacheStats {
  const { entries, bytes, budgetBytes } = routes.stats();
  return {
    routes: { entries, bytes, budgetBytes, hits: routes.hits, misses: routes.misses },
    timelines: { entries: timelines.stats().entries, hits: timelines.hits, misses: timelines.misses },
  };
}

/** The stats of a thread that has kept nothing yet. */
export const emptyDayCache = (): DayCacheStats => ({
  routes: { entries: 0, bytes: 0, budgetBytes: ROUTE_MEMO_BYTES, hits: 0, misses: 0 },
  timelines: { entries: 0, hits: 0, misses: 0 },
});
