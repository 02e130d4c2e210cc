import { EDGE_KINDS, NODE_KINDS, type EdgeKind, type NodeKind, type StationNode } from '../schemas/station';
import type { GraphEdge, StationGraph } from '../schemas/station-edits';

/**
 * The station graph in columns: what the graph endpoint answers, with each node and edge field a
 * list of plain numbers or strings instead of one object per item. It reads back to the same graph
 * (`fromGraphColumns`), and a browser parses it several times faster than the objects (a 100k-node
 * station's arrays of numbers against 100k nested objects), and gzips it smaller. Edges name their
 * ends by node index; a length that was not given is left out (it is the distance between the ends,
 * computed again as the server computes it); ids are sent as steps from the one before.
 */
export interface GraphColumns {
  format: 'tetherwise.graph-columns';
  station: StationGraph['station'];
  segments: StationGraph['segments'];
  hazards: StationGraph['hazards'];
  arms: StationGraph['arms'];
  nodes: {
    keys: string[];
    /** index into NODE_KINDS */
    kinds: number[];
    /** x, y, z of each node in turn */
    positions: number[];
    /** each node that has fields beyond key, kind and position: its index and those fields */
    more: [number, Omit<StationNode, 'key' | 'kind' | 'position'>][];
  };
  edges: {
    /** each edge's id less the previous edge's (the first: less 0) */
    idSteps: number[];
    from: number[];
    to: number[];
    /** index into EDGE_KINDS */
    kinds: number[];
    /** indices of the closed edges */
    closed: number[];
    /** [index, metres] of each edge whose length was given */
    given: [number, number][];
    /** [index, label] of each edge with a label */
    labels: [number, string][];
  };
}

const NODE_KIND_INDEX = new Map<string, number>(NODE_KINDS.map((k, i) => [k, i]));
const EDGE_KIND_INDEX = new Map<string, number>(EDGE_KINDS.map((k, i) => [k, i]));

/** The graph in columns; every edge end must be a node of the graph (a stored station's always is). */
export function toGraphColumns(graph: StationGraph): GraphColumns {
  const n = graph.nodes.length;
  const keys = new Array<string>(n);
  const kinds = new Array<number>(n);
  const positions = new Array<number>(n * 3);
  const more: GraphColumns['nodes']['more'] = [];
  const indexOf = new Map<string, number>();
  graph.nodes.forEach((node, i) => {
    const { key, kind, position, ...rest } = node;
    keys[i] = key;
    kinds[i] = NODE_KIND_INDEX.get(kind)!;
    positions[i * 3] = position[0];
    positions[i * 3 + 1] = position[1];
    positions[i * 3 + 2] = position[2];
    if (Object.keys(rest).length) more.push([i, rest]);
    indexOf.set(key, i);
  });
  const m = graph.edges.length;
  const edges: GraphColumns['edges'] = {
    idSteps: new Array<number>(m),
    from: new Array<number>(m),
    to: new Array<number>(m),
    kinds: new Array<number>(m),
    closed: [],
    given: [],
    labels: [],
  };
  let lastId = 0;
  graph.edges.forEach((e, i) => {
    const from = indexOf.get(e.from);
    const to = indexOf.get(e.to);
    if (from === undefined || to === undefined) throw new Error(`edge ${e.id} names a node the graph lacks`);
    edges.idSteps[i] = e.id - lastId;
    lastId = e.id;
    edges.from[i] = from;
    edges.to[i] = to;
    edges.kinds[i] = EDGE_KIND_INDEX.get(e.kind)!;
    if (e.closed) edges.closed.push(i);
    if (e.lengthGiven) edges.given.push([i, e.lengthM]);
    if (e.label !== undefined) edges.labels.push([i, e.label]);
  });
  return {
    format: 'tetherwise.graph-columns',
    station: graph.station,
    segments: graph.segments,
    hazards: graph.hazards,
    arms: graph.arms,
    nodes: { keys, kinds, positions, more },
    edges,
  };
}

/**
 * The station's nodes and edges as typed arrays and plain lists, one entry per node or edge: what
 * the 3D view draws and what the node finder and the tables show, with no object per node or edge.
 * Kept beside the graph `fromGraphColumns` makes (see graphArraysOf).
 */
export interface GraphArrays {
  keys: readonly string[];
  /** index into NODE_KINDS */
  kinds: Uint8Array;
  positions: Float64Array;
  /** optional unit normals (x, y, z; NaN where the node has none) */
  normals: Float64Array | null;
  /** each node's label, where it has one */
  labels: readonly (string | undefined)[];
  edgeFrom: Uint32Array;
  edgeTo: Uint32Array;
  /** index into EDGE_KINDS */
  edgeKinds: Uint8Array;
  edgeClosed: Uint8Array;
  /** the graph endpoint's edge ids (an edge without one: its place in the list plus one) */
  edgeIds: Float64Array;
  /** the length given, else the distance between the ends */
  edgeLengths: Float64Array;
  /** each edge's label, where it has one */
  edgeLabels: readonly (string | undefined)[];
}

const arraysOfGraph = new WeakMap<object, GraphArrays>();

/** `target[key]` made by `make` when first read, and kept. */
function lazily<T extends object, K extends keyof T>(target: T, key: K, make: () => T[K]) {
  Object.defineProperty(target, key, {
    configurable: true,
    enumerable: true,
    get() {
      const value = make();
      Object.defineProperty(target, key, { value, writable: true, configurable: true, enumerable: true });
      return value;
    },
  });
}

/**
 * The graph the columns hold, equal to the graph endpoint's answer. Its typed arrays are made at
 * once and kept for graphArraysOf; its `nodes` and `edges` objects only when first read (a 100k-node
 * station's are some 220k objects, which the 3D view, the node finder and the tables do without).
 */
export function fromGraphColumns(columns: GraphColumns): StationGraph {
  const { keys, kinds, positions, more } = columns.nodes;
  const n = keys.length;
  const e = columns.edges;
  const m = e.from.length;
  const arrays: GraphArrays = {
    keys,
    kinds: Uint8Array.from(kinds),
    positions: Float64Array.from(positions),
    normals: null,
    labels: new Array<string | undefined>(n),
    edgeFrom: Uint32Array.from(e.from),
    edgeTo: Uint32Array.from(e.to),
    edgeKinds: Uint8Array.from(e.kinds),
    edgeClosed: new Uint8Array(m),
    edgeIds: new Float64Array(m),
    edgeLengths: new Float64Array(m),
    edgeLabels: new Array<string | undefined>(m),
  };
  for (const [i, rest] of more) {
    if (rest.normal) setNormal(arrays, i, rest.normal, n);
    if (rest.label !== undefined) (arrays.labels as (string | undefined)[])[i] = rest.label;
  }
  let id = 0;
  for (let i = 0; i < m; i++) {
    id += e.idSteps[i];
    arrays.edgeIds[i] = id;
  }
  for (const i of e.closed) arrays.edgeClosed[i] = 1;
  for (const [i, label] of e.labels) (arrays.edgeLabels as (string | undefined)[])[i] = label;
  fillLengths(arrays);
  for (const [i, metres] of e.given) arrays.edgeLengths[i] = metres;

  const graph = { station: columns.station, segments: columns.segments } as StationGraph;
  const items = itemMaker(columns, arrays);
  lazily(graph, 'nodes', () => {
    const nodes = new Array<StationNode>(n);
    for (let i = 0; i < n; i++) nodes[i] = items.bareNode(i);
    for (const [i, rest] of more) Object.assign(nodes[i], rest);
    return nodes;
  });
  lazily(graph, 'edges', () => {
    const given = new Set(e.given.map(([i]) => i));
    const edges = new Array<GraphEdge>(m);
    for (let i = 0; i < m; i++) edges[i] = items.edge(i, given.has(i));
    return edges;
  });
  graph.hazards = columns.hazards;
  graph.arms = columns.arms;
  arraysOfGraph.set(graph, arrays);
  itemsOfGraph.set(graph, items);
  return graph;
}

/** One node or edge of a graph read from columns, made from the columns alone. */
interface ItemMaker {
  /** the node's key, kind and position (not its other fields) */
  bareNode(i: number): StationNode;
  node(i: number): StationNode;
  edge(i: number, lengthGiven?: boolean): GraphEdge;
}

const itemsOfGraph = new WeakMap<object, ItemMaker>();

function itemMaker(columns: GraphColumns, arrays: GraphArrays): ItemMaker {
  const { keys, kinds, positions } = arrays;
  const e = columns.edges;
  // the sparse fields by index, made when one item is first asked for
  let more: Map<number, GraphColumns['nodes']['more'][number][1]> | null = null;
  let given: Set<number> | null = null;
  const bareNode = (i: number): StationNode => ({
    key: keys[i],
    kind: NODE_KINDS[kinds[i]],
    position: [positions[i * 3], positions[i * 3 + 1], positions[i * 3 + 2]],
  });
  return {
    bareNode,
    node(i) {
      more ??= new Map(columns.nodes.more);
      return Object.assign(bareNode(i), more.get(i));
    },
    edge(i, lengthGiven) {
      const edge: GraphEdge = {
        id: arrays.edgeIds[i],
        from: keys[arrays.edgeFrom[i]],
        to: keys[arrays.edgeTo[i]],
        kind: EDGE_KINDS[arrays.edgeKinds[i]] as EdgeKind,
        lengthM: arrays.edgeLengths[i],
        lengthGiven: lengthGiven ?? (given ??= new Set(e.given.map(([j]) => j))).has(i),
        closed: arrays.edgeClosed[i] === 1,
      };
      const label = arrays.edgeLabels[i];
      if (label !== undefined) edge.label = label;
      return edge;
    },
  };
}

/**
 * The graph's node at index `i` of its arrays (see graphArraysOf), equal to `graph.nodes[i]`: for a
 * graph read from columns made alone, without making the graph's other nodes.
 */
export function nodeAt(graph: StationGraph, i: number): StationNode {
  const items = itemsOfGraph.get(graph);
  return items ? items.node(i) : graph.nodes[i];
}

/**
 * The graph's edge at index `i` of its arrays, equal to that edge of `graph.edges`: for a graph read
 * from columns made alone, without making the graph's other edges.
 */
export function edgeAt(graph: StationGraph, i: number): GraphEdge {
  const items = itemsOfGraph.get(graph);
  if (items) return items.edge(i);
  // the arrays leave out an edge naming a key the nodes lack, which a stored graph never has
  return graph.edges[i];
}

/** Each edge's length as the distance between its ends (the server's own computation). */
function fillLengths(arrays: GraphArrays) {
  const { positions: p, edgeFrom, edgeTo, edgeLengths } = arrays;
  for (let i = 0; i < edgeFrom.length; i++) {
    const [a, b] = [edgeFrom[i] * 3, edgeTo[i] * 3];
    edgeLengths[i] = Math.hypot(p[a] - p[b], p[a + 1] - p[b + 1], p[a + 2] - p[b + 2]);
  }
}

function setNormal(arrays: GraphArrays, i: number, normal: readonly number[], n: number) {
  if (!arrays.normals) arrays.normals = new Float64Array(n * 3).fill(Number.NaN);
  arrays.normals.set(normal, i * 3);
}

/** The station's nodes and edges as `GraphArrays`, at the least shape the 3D view is given. */
export interface ArraySource {
  nodes: readonly Pick<StationNode, 'key' | 'kind' | 'position' | 'normal' | 'label'>[];
  edges: readonly {
    id?: number;
    from: string;
    to: string;
    kind: EdgeKind;
    closed?: boolean;
    lengthM?: number;
    label?: string;
  }[];
}

/**
 * The typed arrays of a graph: those kept when it was read from columns, else made from its objects
 * (a station document, a graph read as JSON). Edges naming a key the nodes lack are left out.
 */
export function graphArraysOf(station: ArraySource): GraphArrays {
  const kept = arraysOfGraph.get(station);
  if (kept) return kept;
  const n = station.nodes.length;
  const arrays: GraphArrays = {
    keys: station.nodes.map((node) => node.key),
    kinds: new Uint8Array(n),
    positions: new Float64Array(n * 3),
    normals: null,
    labels: station.nodes.map((node) => node.label),
    edgeFrom: new Uint32Array(0),
    edgeTo: new Uint32Array(0),
    edgeKinds: new Uint8Array(0),
    edgeClosed: new Uint8Array(0),
    edgeIds: new Float64Array(0),
    edgeLengths: new Float64Array(0),
    edgeLabels: [],
  };
  const indexOf = new Map<string, number>();
  station.nodes.forEach((node, i) => {
    arrays.kinds[i] = NODE_KIND_INDEX.get(node.kind as NodeKind) ?? 0;
    arrays.positions.set(node.position, i * 3);
    if (node.normal) setNormal(arrays, i, node.normal, n);
    indexOf.set(node.key, i);
  });
  const from: number[] = [];
  const to: number[] = [];
  const kinds: number[] = [];
  const closed: number[] = [];
  const ids: number[] = [];
  const given: [number, number][] = [];
  const labels: (string | undefined)[] = [];
  station.edges.forEach((e, i) => {
    const a = indexOf.get(e.from);
    const b = indexOf.get(e.to);
    if (a === undefined || b === undefined) return;
    if (e.lengthM !== undefined) given.push([from.length, e.lengthM]);
    from.push(a);
    to.push(b);
    kinds.push(EDGE_KIND_INDEX.get(e.kind) ?? 0);
    closed.push(e.closed ? 1 : 0);
    ids.push(e.id ?? i + 1);
    labels.push(e.label);
  });
  arrays.edgeFrom = Uint32Array.from(from);
  arrays.edgeTo = Uint32Array.from(to);
  arrays.edgeKinds = Uint8Array.from(kinds);
  arrays.edgeClosed = Uint8Array.from(closed);
  arrays.edgeIds = Float64Array.from(ids);
  arrays.edgeLengths = new Float64Array(from.length);
  arrays.edgeLabels = labels;
  fillLengths(arrays);
  for (const [i, metres] of given) arrays.edgeLengths[i] = metres;
  arraysOfGraph.set(station, arrays);
  return arrays;
}

const nodeIndexes = new WeakMap<GraphArrays, Map<string, number>>();
const nodeEdges = new WeakMap<GraphArrays, { start: Uint32Array; edges: Uint32Array }>();

/** The indices of the edges at node `i`, in the edges' order (an index made once, then kept). */
export function edgesAtNode(arrays: GraphArrays, i: number): Uint32Array {
  let index = nodeEdges.get(arrays);
  if (!index) {
    const { keys, edgeFrom, edgeTo } = arrays;
    const start = new Uint32Array(keys.length + 1);
    const loop = (e: number) => edgeFrom[e] === edgeTo[e];
    for (let e = 0; e < edgeFrom.length; e++) {
      start[edgeFrom[e] + 1]++;
      if (!loop(e)) start[edgeTo[e] + 1]++;
    }
    for (let k = 0; k < keys.length; k++) start[k + 1] += start[k];
    const edges = new Uint32Array(start[keys.length]);
    const fill = start.slice(0, keys.length);
    for (let e = 0; e < edgeFrom.length; e++) {
      edges[fill[edgeFrom[e]]++] = e;
      if (!loop(e)) edges[fill[edgeTo[e]]++] = e;
    }
    nodeEdges.set(arrays, (index = { start, edges }));
  }
  return index.edges.subarray(index.start[i], index.start[i + 1]);
}

/** The index of the edge with this id in the arrays, or -1. */
export function edgeIndexOf(arrays: GraphArrays, id: number): number {
  return arrays.edgeIds.indexOf(id);
}

/** Each node key's index in the arrays (made when first asked, then kept). */
export function nodeIndexOf(arrays: GraphArrays): ReadonlyMap<string, number> {
  let index = nodeIndexes.get(arrays);
  if (!index) nodeIndexes.set(arrays, (index = new Map(arrays.keys.map((k, i) => [k, i]))));
  return index;
}
