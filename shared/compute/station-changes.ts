import type {
  Arm,
  Hazard,
  OrbitSettings,
  Segment,
  StationDocument,
  StationEdge,
  StationNode,
  StationSettings,
} from '../schemas/station';

/**
 * What one write changed in a station model, so that every version can be rebuilt from the first by
 * applying the changes in order, and nothing is ever overwritten in place.
 *
 * Items are named by their identity: a node, hazard, segment or arm by its key, an edge by its two ends
 * (in either order) and its kind, which a station never repeats. Within a collection the order is
 * kept: `removed` drops items, `changed` replaces items in place (same identity), `replaced`
 * replaces the item of an identity in place with one of another identity (an edge given new ends),
 * `added` appends. When the new order is not that, `all` gives the whole collection instead.
 */
export interface CollectionChange<T> {
  removed?: string[];
  changed?: T[];
  replaced?: { id: string; item: T }[];
  added?: T[];
  all?: T[];
}

export interface StationChange {
  name?: string;
  orbit?: OrbitSettings;
  settings?: StationSettings;
  segments?: CollectionChange<Segment>;
  nodes?: CollectionChange<StationNode>;
  edges?: CollectionChange<StationEdge>;
  hazards?: CollectionChange<Hazard>;
  arms?: CollectionChange<Arm>;
}

export const COLLECTIONS = ['segments', 'nodes', 'edges', 'hazards', 'arms'] as const;
export type Collection = (typeof COLLECTIONS)[number];

/** An edge's identity: its two ends in key order and its kind (`A|B|handrail`). */
export function edgeId(e: Pick<StationEdge, 'from' | 'to' | 'kind'>): string {
  const [a, b] = e.from < e.to ? [e.from, e.to] : [e.to, e.from];
  return `${a}|${b}|${e.kind}`;
}

const keyOf = (item: { key: string }) => item.key;

export const IDENTITY: { [C in Collection]: (item: StationDocument[C][number]) => string } = {
  segments: keyOf,
  nodes: keyOf,
  edges: (e) => edgeId(e as StationEdge),
  hazards: keyOf,
  arms: keyOf,
};

/** The document before the first version: a station with nothing in it. */
export function emptyStationDocument(): StationDocument {
  return {
    format: 'tetherwise.station',
    version: 1,
    name: '',
    orbit: { altitudeKm: 0, betaDeg: 0 },
    settings: {} as StationSettings,
    segments: [],
    nodes: [],
    edges: [],
    hazards: [],
    arms: [],
  };
}

/** Deep equality of JSON-like values; a property that is undefined counts as absent. */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    return a.length === bb.length && a.every((v, i) => sameValue(v, bb[i]));
  }
  const ao = a as Record<string, unknown>;
  const bo = b as Record<string, unknown>;
  const keys = new Set([...Object.keys(ao), ...Object.keys(bo)]);
  for (const k of keys) if (!sameValue(ao[k], bo[k])) return false;
  return true;
}

/** A change that changes nothing. */
export function isEmptyChange(change: StationChange): boolean {
  return Object.values(change).every((v) => v === undefined);
}

/** What a change took out of a collection and what it brought in, at its place in the new list. */
export interface CollectionDelta {
  gone: unknown[];
  came: { item: unknown; at: number }[];
}

/**
 * Each identity's place in a list, made when first needed and handed on to the list a change makes
 * from it (moved, not shared: the older list makes its own again if it is changed again), so a
 * change finds the items it names without making the identity of every item (an edge's is a string
 * built from its ends). Lists whose identities repeat get none.
 */
const placesOf = new WeakMap<readonly unknown[], Map<string, number> | null>();

function placesIn<T>(
  items: readonly T[],
  id: (item: T) => string,
  names: Iterable<string>,
): Map<string, number> | null {
  let places = placesOf.get(items);
  // kept places are checked where they are read (a list is never changed in place, but a caller's
  // mistake must not turn into the wrong item changed): else made again
  if (places === null) return null;
  if (places && places.size === items.length) {
    let sound = true;
    for (const k of names) {
      const at = places.get(k);
      if (at !== undefined && id(items[at]) !== k) sound = false;
    }
    if (sound) return places;
  }
  places = new Map<string, number>();
  for (let i = 0; i < items.length; i++) places.set(id(items[i]), i);
  if (places.size !== items.length) places = null;
  placesOf.set(items, places);
  return places;
}

function applyCollection<T>(
  items: readonly T[],
  change: CollectionChange<T>,
  id: (item: T) => string,
  keep: <X>(x: X) => X,
  delta?: CollectionDelta,
): T[] {
  if (change.all) {
    const all = change.all.map((x) => structuredClone(x));
    delta?.gone.push(...items);
    delta?.came.push(...all.map((item, at) => ({ item, at })));
    return all;
  }
  const byId = new Map<string, T>();
  for (const item of change.changed ?? []) byId.set(id(item), item);
  for (const r of change.replaced ?? []) byId.set(r.id, r.item);
  const removed = new Set(change.removed ?? []);
  const out: T[] = [];
  const seen = new Set<string>();
  // a change that only appends leaves every item where it was: no identity to look up
  const places =
    byId.size === 0 && removed.size === 0
      ? placesOf.get(items)?.size === items.length
        ? placesOf.get(items)
        : undefined
      : placesIn(items, id, [...removed, ...byId.keys()]);
  const touched: number[] = [];
  if (places) {
    for (const k of [...removed, ...byId.keys()]) {
      const at = places.get(k);
      if (at !== undefined) touched.push(at);
    }
    touched.sort((a, b) => a - b);
  }
  // where the first item taken out was (the items after it move up) and where replaced ones are
  let shifted = Infinity;
  const renamed: number[] = [];
  /** an item, taken out, replaced or kept */
  const visit = (item: T, k: string) => {
    if (removed.has(k)) {
      shifted = Math.min(shifted, out.length);
      delta?.gone.push(item);
      return;
    }
    const next = byId.get(k);
    if (next === undefined) {
      out.push(keep(item));
      return;
    }
    seen.add(k);
    if (id(next) !== k) renamed.push(out.length);
    const made = structuredClone(next);
    delta?.gone.push(item);
    delta?.came.push({ item: made, at: out.length });
    out.push(made);
  };
  if (places || (byId.size === 0 && removed.size === 0)) {
    let from = 0;
    for (const at of touched) {
      if (at < from) continue;
      for (let i = from; i < at; i++) out.push(keep(items[i]));
      visit(items[at], id(items[at]));
      from = at + 1;
    }
    for (let i = from; i < items.length; i++) out.push(keep(items[i]));
  } else for (const item of items) visit(item, id(item));
  for (const k of byId.keys()) {
    if (!seen.has(k)) throw new Error(`the change names an item "${k}" the station does not have`);
  }
  const kept = out.length;
  for (const item of change.added ?? []) {
    const made = structuredClone(item);
    delta?.came.push({ item: made, at: out.length });
    out.push(made);
  }
  if (places) handOn(places, items, out, { shifted, renamed, kept }, change, id);
  return out;
}

/**
 * Moves `places` from `items` to `out`, the list a change made of it: the places from the first
 * item taken out on are read again (those items moved up), and those of the items given another
 * identity and of the added ones are set. When `out` repeats an identity, it gets none.
 */
function handOn<T>(
  places: Map<string, number>,
  items: readonly T[],
  out: readonly T[],
  at: { shifted: number; renamed: readonly number[]; kept: number },
  change: CollectionChange<T>,
  id: (item: T) => string,
) {
  placesOf.delete(items);
  for (const k of change.removed ?? []) places.delete(k);
  for (const r of change.replaced ?? []) places.delete(r.id);
  const read = (i: number) => places.set(id(out[i]), i);
  for (const i of at.renamed) if (i < at.shifted) read(i);
  for (let i = Math.min(at.shifted, at.kept); i < out.length; i++) read(i);
  // every identity of `out` is a key, and no other: as many keys as items, or one repeats
  if (places.size === out.length) placesOf.set(out, places);
}

/**
 * The document after a change: a new object, the input untouched. With `share`, the items the
 * change leaves alone are the input's own objects (not copies): for a caller that never mutates
 * either document, a change costs the items it brings, not a copy of the whole station.
 */
export function applyStationChange(
  doc: StationDocument,
  change: StationChange,
  {
    share = false,
    delta,
  }: {
    share?: boolean;
    /** filled with what the change took out of each collection and brought in */
    delta?: Record<Collection, CollectionDelta>;
  } = {},
): StationDocument {
  const keep = share ? <X>(x: X) => x : <X>(x: X) => structuredClone(x);
  const next: StationDocument = {
    ...doc,
    name: change.name ?? doc.name,
    orbit: structuredClone(change.orbit ?? doc.orbit),
    settings: structuredClone(change.settings ?? doc.settings),
  };
  for (const c of COLLECTIONS) {
    const part = change[c];
    const id = IDENTITY[c] as (item: unknown) => string;
    // documents kept from before stations had arms have no `arms` list
    const items = (doc[c] as unknown[] | undefined) ?? [];
    (next as unknown as Record<Collection, unknown[]>)[c] = part
      ? applyCollection(items, part as CollectionChange<unknown>, id, keep, delta?.[c])
      : share
        ? items
        : items.map((x) => structuredClone(x));
  }
  return next;
}

/** Applies the changes of every version in order to the empty document. */
export function replayStationChanges(
  changes: readonly StationChange[],
  from: StationDocument = emptyStationDocument(),
): StationDocument {
  return changes.reduce((doc, change) => applyStationChange(doc, change), from);
}

function diffCollection<T>(
  a: readonly T[],
  b: readonly T[],
  id: (item: T) => string,
): CollectionChange<T> | undefined {
  const aIds = a.map(id);
  const bIds = b.map(id);
  const whole = (): CollectionChange<T> | undefined =>
    a.length === b.length && a.every((x, i) => sameValue(x, b[i])) ? undefined : { all: [...b] };
  // a repeated identity cannot be named: say the whole collection
  if (new Set(aIds).size !== aIds.length || new Set(bIds).size !== bIds.length) return whole();
  const inA = new Map(a.map((x, i) => [aIds[i], x]));
  const inB = new Set(bIds);
  const removed = aIds.filter((k) => !inB.has(k));
  const changed: T[] = [];
  const added: T[] = [];
  b.forEach((x, i) => {
    const before = inA.get(bIds[i]);
    if (before === undefined) added.push(x);
    else if (!sameValue(before, x)) changed.push(x);
  });
  // the order a change of this shape gives: the kept items in their old order, then the added ones
  const natural = [...aIds.filter((k) => inB.has(k)), ...added.map(id)];
  if (natural.some((k, i) => k !== bIds[i])) return whole();
  const out: CollectionChange<T> = {
    ...(removed.length ? { removed } : {}),
    ...(changed.length ? { changed } : {}),
    ...(added.length ? { added } : {}),
  };
  return Object.keys(out).length ? out : undefined;
}

/** The change that turns `a` into `b`: `applyStationChange(a, diffStationDocuments(a, b))` equals `b`. */
export function diffStationDocuments(a: StationDocument, b: StationDocument): StationChange {
  const change: StationChange = {};
  if (a.name !== b.name) change.name = b.name;
  if (!sameValue(a.orbit, b.orbit)) change.orbit = b.orbit;
  if (!sameValue(a.settings, b.settings)) change.settings = b.settings;
  for (const c of COLLECTIONS) {
    const id = IDENTITY[c] as (item: unknown) => string;
    const part = diffCollection(a[c] as unknown[], b[c] as unknown[], id);
    if (part) (change as Record<Collection, unknown>)[c] = part;
  }
  return change;
}

/** How many items a change names: a measure of its size. */
export function changeSize(change: StationChange): number {
  let n = 0;
  for (const c of COLLECTIONS) {
    const p = change[c] as CollectionChange<unknown> | undefined;
    if (!p) continue;
    n += p.all?.length ?? 0;
    n += (p.removed?.length ?? 0) + (p.changed?.length ?? 0) + (p.replaced?.length ?? 0);
    n += p.added?.length ?? 0;
  }
  return n;
}

/** One line per kind of change, for lists: "2 nodes added, 1 edge changed, settings changed". */
export function summarizeStationChange(change: StationChange): string[] {
  const out: string[] = [];
  if (change.name !== undefined) out.push(`renamed to ${change.name}`);
  if (change.orbit) out.push('orbit changed');
  if (change.settings) out.push('settings changed');
  const nouns: Record<Collection, [string, string]> = {
    segments: ['segment', 'segments'],
    nodes: ['node', 'nodes'],
    edges: ['edge', 'edges'],
    hazards: ['hazard', 'hazards'],
    arms: ['arm', 'arms'],
  };
  for (const c of COLLECTIONS) {
    const p = change[c] as CollectionChange<unknown> | undefined;
    if (!p) continue;
    const [one, many] = nouns[c];
    const say = (n: number, what: string) => n && out.push(`${n} ${n === 1 ? one : many} ${what}`);
    if (p.all) say(p.all.length, 'given as a new list');
    say(p.added?.length ?? 0, 'added');
    say((p.changed?.length ?? 0) + (p.replaced?.length ?? 0), 'changed');
    say(p.removed?.length ?? 0, 'removed');
  }
  return out;
}
