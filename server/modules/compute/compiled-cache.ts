import { eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { stations } from '../../db/schema';
import { notFound } from '../../lib/http-error';
import { compileStation, isAttachKind, type CompiledStation } from '@shared/compute/compiled-station';
import type { StationDocument } from '@shared/schemas/station';
import { getStationSnapshot } from '../stations/stations.service';
import { stationDocumentAt } from '../stations/station-versions.service';
import { forgetStation } from './day-cache';

/**
 * One station version: its document, node keys and query index. The index is compiled on first
 * use, so a caller that only needs the document (or hands routes to the worker pool) never pays
 * for it on the main thread.
 */
export class CompiledEntry {
  readonly nodeKeys: ReadonlySet<string>;
  /** the station's own tether attach points */
  readonly attachKeys: ReadonlySet<string>;
  private index: CompiledStation | null = null;

  constructor(
    readonly stationId: number,
    readonly version: number,
    readonly doc: StationDocument,
  ) {
    this.nodeKeys = new Set(doc.nodes.map((n) => n.key));
    this.attachKeys = new Set(doc.nodes.filter((n) => isAttachKind(n.kind)).map((n) => n.key));
  }

  get compiled(): CompiledStation {
    return (this.index ??= compileStation(this.doc));
  }

  /** whether the query index is compiled already (reading `compiled` would not compile it now) */
  get isCompiled(): boolean {
    return this.index !== null;
  }

  /** Drops the routes and timelines this thread kept of the entry's days (it is no longer held). */
  forget(): void {
    if (this.index) forgetStation(this.index);
  }
}

/** A few stations at a time: compiling a large truss costs far more than keeping its index. */
export const CACHE_STATIONS = 4;

// per database, so two apps in one process (tests) never see each other's stations
const caches = new WeakMap<Db, Map<number, CompiledEntry>>();

export function stationVersion(db: Db, stationId: number): number | null {
  return (
    db.select({ version: stations.version }).from(stations).where(eq(stations.id, stationId)).get()
      ?.version ?? null
  );
}

/**
 * The station's document and query index, compiled once per (station, version) when first asked for. Each call costs
 * one version lookup; a new version replaces the station's old entry, and the least recently used
 * station drops out when more than CACHE_STATIONS are held.
 */
export function getCompiledStation(ctx: AppContext, stationId: number): CompiledEntry {
  let cache = caches.get(ctx.db);
  if (!cache) caches.set(ctx.db, (cache = new Map()));
  const version = stationVersion(ctx.db, stationId);
  if (version === null) throw notFound('Station');
  const hit = cache.get(stationId);
  if (hit && hit.version === version) {
    cache.delete(stationId);
    cache.set(stationId, hit);
    return hit;
  }
  // document and version from one transaction, so an index is never filed under the wrong version
  const snapshot = getStationSnapshot(ctx.db, stationId);
  const entry = new CompiledEntry(stationId, snapshot.version, snapshot.document);
  if (hit) hit.forget();
  cache.delete(stationId);
  cache.set(stationId, entry);
  dropOldest(cache);
  return entry;
}

/** Station ids held, least recently used first. */
export function cachedStationIds(ctx: AppContext): number[] {
  return [...(caches.get(ctx.db)?.keys() ?? [])];
}

// earlier versions, kept apart so a pinned plan never pushes the live station out of the cache
const pinnedCaches = new WeakMap<Db, Map<string, CompiledEntry>>();

/**
 * A kept version of the station (an approved plan is computed against the one it was approved on):
 * the live entry when it is the current version, else rebuilt from the version history once and
 * held among the last few asked for.
 */
export function getCompiledStationAt(ctx: AppContext, stationId: number, version: number): CompiledEntry {
  const live = getCompiledStation(ctx, stationId);
  if (live.version === version) return live;
  let cache = pinnedCaches.get(ctx.db);
  if (!cache) pinnedCaches.set(ctx.db, (cache = new Map()));
  const key = `${stationId}@${version}`;
  let entry = cache.get(key);
  if (entry) cache.delete(key);
  else entry = new CompiledEntry(stationId, version, stationDocumentAt(ctx.db, stationId, version));
  cache.set(key, entry);
  dropOldest(cache);
  return entry;
}

/** Drops the least recently used entries past CACHE_STATIONS, and what the days kept of them. */
function dropOldest<K>(cache: Map<K, CompiledEntry>) {
  while (cache.size > CACHE_STATIONS) {
    const oldest = cache.keys().next().value!;
    cache.get(oldest)!.forget();
    cache.delete(oldest);
  }
}
