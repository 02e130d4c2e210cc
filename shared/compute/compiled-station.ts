import type { EdgeKind, NodeKind, StationDocument, StationSettings } from '../schemas/station';
import { EDGE_KINDS, NODE_KINDS } from '../schemas/station';
import { dist, hazardBounds, segmentIntersectsHazard } from './geometry';
import { MinHeap } from './routes-heap';

/** Per-edge flag bits (edgeFlags / arcFlags). */
export const EDGE_CLOSED = 1;
export const EDGE_KEEP_OUT = 2;
export const EDGE_RIDE = 4;
export const EDGE_CAUTION = 8;

export const EDGE_KIND_CODE: Record<EdgeKind, number> = { handrail: 0, hop: 1, ride: 2 };

export interface Landmarks {
  count: number;
  nodes: Int32Array;
  /** node-major: value for node v and landmark k at v * count + k; Infinity when unreachable */
  seconds: Float64Array;
  metres: Float64Array;
}

/**
 * The query index of one station version, in CSR form. Edges are two-way: edge e has arcs in both
 * directions; arc arrays repeat the hot per-edge data so the search loops read one array position.
 */
export interface CompiledStation {
  nodeCount: number;
  edgeCount: number;
  keys: string[];
  keyToIndex: Map<string, number>;
  nodeKind: Uint8Array;
  isAttach: Uint8Array;
  positions: Float64Array;
  offsets: Int32Array;
  targets: Int32Array;
  arcEdge: Int32Array;
  arcLengthM: Float64Array;
  arcSeconds: Float64Array;
  arcFlags: Uint8Array;
  edgeFrom: Int32Array;
  edgeTo: Int32Array;
  edgeLengthM: Float64Array;
  edgeKind: Uint8Array;
  edgeFlags: Uint8Array;
  keepOutByEdge: Map<number, string[]>;
  cautionByEdge: Map<number, string[]>;
  /** the settings arcSeconds and the landmark bounds were computed with */
  settings: StationSettings;
  landmarks: Landmarks;
  memoryBytes: number;
}

export interface CompileOptions {
  /** landmarks for the search's lower bounds; more tighten them and cost 16 bytes per node each */
  landmarks?: number;
}

export function speedOf(kind: EdgeKind, settings: StationSettings): number {
  return settings.speedsMps[kind];
}

/**
 * Translation time of one edge: its length over the speed of its kind, plus `hopSeconds` on a hop;
 * carrying a large item multiplies the whole by the station's `carryFactor`.
 */
export function edgeSeconds(
  kind: EdgeKind,
  lengthM: number,
  settings: StationSettings,
  carrying = false,
): number {
  const base = lengthM / speedOf(kind, settings) + (kind === 'hop' ? settings.hopSeconds : 0);
  return carrying ? base * settings.carryFactor : base;
}

export function hasNodeKey(compiled: CompiledStation, key: string): boolean {
  return compiled.keyToIndex.has(key);
}

export function edgeKindName(code: number): EdgeKind {
  return EDGE_KINDS[code];
}

function fillArcSeconds(c: CompiledStation, settings: StationSettings, out: Float64Array): Float64Array {
  for (let a = 0; a < out.length; a++) {
    const e = c.arcEdge[a];
    out[a] = edgeSeconds(EDGE_KINDS[c.edgeKind[e]], c.edgeLengthM[e], settings);
  }
  return out;
}

function sameTimeSettings(a: StationSettings, b: StationSettings): boolean {
  return (
    a.hopSeconds === b.hopSeconds &&
    a.speedsMps.handrail === b.speedsMps.handrail &&
    a.speedsMps.hop === b.speedsMps.hop &&
    a.speedsMps.ride === b.speedsMps.ride
  );
}

const otherSeconds = new WeakMap<CompiledStation, Map<string, Float64Array>>();

/**
 * Arc times (not carrying) for `settings`, and whether the compiled landmark time bounds hold for
 * them. Settings other than the compiled ones get their own cached array.
 */
export function arcSecondsFor(
  c: CompiledStation,
  settings: StationSettings,
): { arcSeconds: Float64Array; landmarkTimesValid: boolean } {
  if (sameTimeSettings(c.settings, settings)) return { arcSeconds: c.arcSeconds, landmarkTimesValid: true };
  let cache = otherSeconds.get(c);
  if (!cache) otherSeconds.set(c, (cache = new Map()));
  const sig = `${settings.hopSeconds}|${settings.speedsMps.handrail}|${settings.speedsMps.hop}|${settings.speedsMps.ride}`;
  let arr = cache.get(sig);
  if (!arr) {
    if (cache.size > 8) cache.clear();
    arr = fillArcSeconds(c, settings, new Float64Array(c.targets.length));
    cache.set(sig, arr);
  }
  return { arcSeconds: arr, landmarkTimesValid: false };
}

/** Single-source Dijkstra over every arc (no exclusions): landmark distances. */
function dijkstraAll(
  c: CompiledStation,
  weights: Float64Array,
  source: number,
  out: Float64Array,
  heap: MinHeap,
) {
  out.fill(Infinity);
  out[source] = 0;
  heap.clear();
  heap.push(source, 0);
  const { offsets, targets } = c;
  while (heap.size > 0) {
    const d = heap.topKey1();
    const v = heap.pop();
    if (d > out[v]) continue;
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      const u = targets[a];
      const nd = d + weights[a];
      if (nd < out[u]) {
        out[u] = nd;
        heap.push(u, nd);
      }
    }
  }
}

/** Farthest-first landmarks: each next one is the node farthest (in metres) from those chosen. */
function computeLandmarks(c: CompiledStation, wanted: number): Landmarks {
  const n = c.nodeCount;
  const count = Math.min(wanted, n);
  const nodes = new Int32Array(count);
  const seconds = new Float64Array(n * count);
  const metres = new Float64Array(n * count);
  const heap = new MinHeap(Math.max(16, n));
  const dm = new Float64Array(n);
  const ds = new Float64Array(n);
  const nearest = new Float64Array(n).fill(Infinity);
  let next = 0;
  if (count > 0) {
    dijkstraAll(c, c.arcLengthM, 0, dm, heap);
    for (let v = 0; v < n; v++) if (dm[v] > dm[next]) next = v;
  }
  for (let k = 0; k < count; k++) {
    nodes[k] = next;
    dijkstraAll(c, c.arcLengthM, next, dm, heap);
    dijkstraAll(c, c.arcSeconds, next, ds, heap);
    let far = 0;
    for (let v = 0; v < n; v++) {
      metres[v * count + k] = dm[v];
      seconds[v * count + k] = ds[v];
      if (dm[v] < nearest[v]) nearest[v] = dm[v];
      if (nearest[v] > nearest[far]) far = v;
    }
    next = far;
  }
  return { count, nodes, seconds, metres };
}

function flagHazards(doc: StationDocument, c: CompiledStation): void {
  const { edgeFrom, edgeTo, positions, edgeFlags } = c;
  doc.hazards.forEach((h) => {
    const { min, max } = hazardBounds(h);
    const byEdge = h.kind === 'keep-out' ? c.keepOutByEdge : c.cautionByEdge;
    const bit = h.kind === 'keep-out' ? EDGE_KEEP_OUT : EDGE_CAUTION;
    for (let e = 0; e < c.edgeCount; e++) {
      const i = edgeFrom[e] * 3;
      const j = edgeTo[e] * 3;
      let outside = false;
      for (let d = 0; d < 3 && !outside; d++) {
        const lo = Math.min(positions[i + d], positions[j + d]);
        const hi = Math.max(positions[i + d], positions[j + d]);
        outside = hi < min[d] || lo > max[d];
      }
      if (outside) continue;
      const a = [positions[i], positions[i + 1], positions[i + 2]] as const;
      const b = [positions[j], positions[j + 1], positions[j + 2]] as const;
      if (!segmentIntersectsHazard(a, b, h)) continue;
      edgeFlags[e] |= bit;
      const list = byEdge.get(e);
      if (list) list.push(h.key);
      else byEdge.set(e, [h.key]);
    }
  });
}

function approxMapBytes(c: CompiledStation): number {
  let bytes = 0;
  for (const k of c.keys) bytes += 48 + 2 * k.length; // string + Map entry, V8-ish
  for (const m of [c.keepOutByEdge, c.cautionByEdge])
    for (const list of m.values()) bytes += 40 + 8 * list.length;
  return bytes;
}

/** Node kinds a tether can be clipped to (attach points of the station itself). */
export function isAttachKind(kind: string): boolean {
  return kind === 'anchor' || kind === 'airlock';
}

/** Builds the query index for one station version. Keys must already be checked (parseStationDocument). */
export function compileStation(doc: StationDocument, options: CompileOptions = {}): CompiledStation {
  const n = doc.nodes.length;
  const m = doc.edges.length;
  const keys = doc.nodes.map((nd) => nd.key);
  const keyToIndex = new Map<string, number>();
  keys.forEach((k, i) => keyToIndex.set(k, i));
  const nodeKind = new Uint8Array(n);
  const isAttach = new Uint8Array(n);
  const positions = new Float64Array(n * 3);
  doc.nodes.forEach((nd, i) => {
    nodeKind[i] = NODE_KINDS.indexOf(nd.kind as NodeKind);
    isAttach[i] = isAttachKind(nd.kind) ? 1 : 0;
    positions.set(nd.position, i * 3);
  });

  const edgeFrom = new Int32Array(m);
  const edgeTo = new Int32Array(m);
  const edgeLengthM = new Float64Array(m);
  const edgeKind = new Uint8Array(m);
  const edgeFlags = new Uint8Array(m);
  const degree = new Int32Array(n + 1);
  doc.edges.forEach((e, i) => {
    const f = keyToIndex.get(e.from);
    const t = keyToIndex.get(e.to);
    if (f === undefined || t === undefined) throw new Error(`edge ${i} names an unknown node`);
    edgeFrom[i] = f;
    edgeTo[i] = t;
    edgeLengthM[i] = e.lengthM ?? dist(doc.nodes[f].position, doc.nodes[t].position);
    edgeKind[i] = EDGE_KIND_CODE[e.kind];
    edgeFlags[i] = (e.closed ? EDGE_CLOSED : 0) | (e.kind === 'ride' ? EDGE_RIDE : 0);
    degree[f + 1]++;
    degree[t + 1]++;
  });
  const offsets = new Int32Array(n + 1);
  for (let v = 0; v < n; v++) offsets[v + 1] = offsets[v] + degree[v + 1];
  const fill = offsets.slice(0, n);
  const targets = new Int32Array(2 * m);
  const arcEdge = new Int32Array(2 * m);
  for (let e = 0; e < m; e++) {
    const f = edgeFrom[e];
    const t = edgeTo[e];
    targets[fill[f]] = t;
    arcEdge[fill[f]++] = e;
    targets[fill[t]] = f;
    arcEdge[fill[t]++] = e;
  }

  const c: CompiledStation = {
    nodeCount: n,
    edgeCount: m,
    keys,
    keyToIndex,
    nodeKind,
    isAttach,
    positions,
    offsets,
    targets,
    arcEdge,
    arcLengthM: new Float64Array(2 * m),
    arcSeconds: new Float64Array(2 * m),
    arcFlags: new Uint8Array(2 * m),
    edgeFrom,
    edgeTo,
    edgeLengthM,
    edgeKind,
    edgeFlags,
    keepOutByEdge: new Map(),
    cautionByEdge: new Map(),
    settings: doc.settings,
    landmarks: {
      count: 0,
      nodes: new Int32Array(0),
      seconds: new Float64Array(0),
      metres: new Float64Array(0),
    },
    memoryBytes: 0,
  };
  flagHazards(doc, c);
  for (let a = 0; a < 2 * m; a++) {
    const e = arcEdge[a];
    c.arcLengthM[a] = edgeLengthM[e];
    c.arcFlags[a] = edgeFlags[e];
  }
  fillArcSeconds(c, doc.settings, c.arcSeconds);
  c.landmarks = computeLandmarks(c, options.landmarks ?? 4);

  let bytes = approxMapBytes(c);
  for (const v of Object.values(c)) if (ArrayBuffer.isView(v)) bytes += v.byteLength;
  bytes += c.landmarks.nodes.byteLength + c.landmarks.seconds.byteLength + c.landmarks.metres.byteLength;
  c.memoryBytes = bytes;
  return c;
}
