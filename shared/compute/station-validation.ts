import {
  armProblems,
  ArmSchema,
  checkStationGraphRules,
  edgePairKey,
  EdgeSchema,
  formatIssuePath,
  HazardSchema,
  NodeSchema,
  parseStationDocument,
  SegmentSchema,
  StationDocumentSchema,
  STATION_LIMITS,
  type DocumentProblem,
  type StationDocument,
  type StationEdge,
} from '../schemas/station';
import {
  applyStationChange,
  COLLECTIONS,
  type Collection,
  type CollectionDelta,
  type StationChange,
} from './station-changes';
import type { z } from 'zod';

const ITEM_SCHEMA: { [C in Collection]: z.ZodType } = {
  segments: SegmentSchema,
  nodes: NodeSchema,
  edges: EdgeSchema,
  hazards: HazardSchema,
  arms: ArmSchema,
};

/** Every problem of the document `change` makes of `before`, by the document rules: the whole model checked. */
export function changeProblemsFull(before: StationDocument, change: StationChange): DocumentProblem[] {
  const checked = parseStationDocument(applyStationChange(before, change));
  return checked.ok ? [] : checked.problems;
}

/**
 * The same problems as changeProblemsFull for a `before` that passes the document rules, found
 * without checking again what the change leaves alone: the schemas run on the station's own fields
 * and on the items the change brings (an item it leaves is the same object in the new document),
 * and the graph rules on what the change brings and takes away, against an index of the model's
 * keys, edge pairs and edge ends (see GraphIndex). Also answers the new document, which shares the
 * untouched items with `before`: neither may be mutated.
 */
export function changeProblems(
  before: StationDocument,
  change: StationChange,
): { doc: StationDocument; problems: DocumentProblem[] } {
  const { doc, delta } = applyTracked(before, change);
  const problems: DocumentProblem[] = [];
  const issue = (prefix: string) => (i: z.core.$ZodIssue) =>
    problems.push({ path: formatIssuePath([...prefixPath(prefix), ...i.path]), message: i.message });
  // the station's own fields and the collections' sizes, with every collection but the arms empty
  const sizes = StationDocumentSchema.safeParse({
    ...doc,
    segments: [],
    nodes: [],
    edges: [],
    hazards: [],
  });
  if (!sizes.success) sizes.error.issues.forEach(issue(''));
  for (const c of COLLECTIONS) {
    if (c === 'arms') continue;
    for (const { item, at } of delta.came[c]) {
      const parsed = ITEM_SCHEMA[c].safeParse(item);
      if (!parsed.success) parsed.error.issues.forEach(issue(`${c}.${at}`));
    }
  }
  const over = Object.entries(STATION_LIMITS).filter(
    ([c, max]) => doc[c as keyof typeof STATION_LIMITS].length > max,
  );
  // a collection past its size is what the whole schema reports first: leave it to the full check
  if (over.length) return { doc, problems: changeProblemsFull(before, change) };
  // an item the schemas refused may have keys or ends that are not text: the whole graph rules
  // then, which skip what they cannot read
  if (problems.length) return { doc, problems: [...problems, ...checkStationGraphRules(doc)] };
  const index = indexOf(before);
  // a problem found: the whole graph rules name it (paths, first occurrences) as the full check does
  if (graphBroken(index, delta, doc)) return { doc, problems: checkStationGraphRules(doc) };
  moveIndex(before, doc, index, delta);
  return { doc, problems: [] };
}

/**
 * The document after a change its caller knows keeps the document rules (a deletion that takes the
 * node's edges with it): applyStationChange with shared items, carrying `before`'s graph index
 * over so the next checked edit does not rebuild it.
 */
export function applyValidChange(before: StationDocument, change: StationChange): StationDocument {
  const { doc, delta } = applyTracked(before, change);
  const index = indexes.get(before);
  if (index) moveIndex(before, doc, index, delta);
  return doc;
}

/**
 * What the graph rules need of a document that passes them: its node, segment and hazard keys, its
 * edges by pair (both ends in key order and the kind, as the rule on twins reads them) and how many
 * edges name each node. One per document, moved to the document an edit makes from it (so an older
 * document that is checked again rebuilds its own).
 */
interface GraphIndex {
  nodes: Set<string>;
  segments: Set<string>;
  hazards: Set<string>;
  pairs: Set<string>;
  ends: Map<string, number>;
}

const indexes = new WeakMap<StationDocument, GraphIndex>();

function indexOf(doc: StationDocument): GraphIndex {
  let index = indexes.get(doc);
  if (index) return index;
  index = {
    nodes: new Set(doc.nodes.map((n) => n.key)),
    segments: new Set(doc.segments.map((s) => s.key)),
    hazards: new Set(doc.hazards.map((h) => h.key)),
    pairs: new Set(doc.edges.map(edgePairKey)),
    ends: new Map(),
  };
  for (const e of doc.edges) countEnds(index.ends, e, 1);
  indexes.set(doc, index);
  return index;
}

function countEnds(ends: Map<string, number>, e: StationEdge, by: number) {
  ends.set(e.from, (ends.get(e.from) ?? 0) + by);
  ends.set(e.to, (ends.get(e.to) ?? 0) + by);
}

type Keyed = 'nodes' | 'segments' | 'hazards';
const KEYED: readonly Keyed[] = ['nodes', 'segments', 'hazards'];

/**
 * The items an edit took out of each collection and those it brought in, with their places in the
 * new document (a changed item is both), as applyStationChange reports them.
 */
interface Delta {
  gone: { [C in Collection]: StationDocument[C][number][] };
  came: { [C in Collection]: { item: StationDocument[C][number]; at: number }[] };
}

/** `applyStationChange` with shared items, and what it took out and brought in. */
function applyTracked(
  before: StationDocument,
  change: StationChange,
): { doc: StationDocument; delta: Delta } {
  const delta = {
    gone: { segments: [], nodes: [], edges: [], hazards: [], arms: [] },
    came: { segments: [], nodes: [], edges: [], hazards: [], arms: [] },
  } as Delta;
  const parts = Object.fromEntries(
    COLLECTIONS.map((c) => [c, { gone: delta.gone[c], came: delta.came[c] } as CollectionDelta]),
  ) as Record<Collection, CollectionDelta>;
  return { doc: applyStationChange(before, change, { share: true, delta: parts }), delta };
}

/** Whether `doc`, made from the indexed document by `delta`, breaks any graph rule. */
function graphBroken(index: GraphIndex, delta: Delta, doc: StationDocument): boolean {
  const gone = {
    nodes: new Set(delta.gone.nodes.map((x) => x.key)),
    segments: new Set(delta.gone.segments.map((x) => x.key)),
    hazards: new Set(delta.gone.hazards.map((x) => x.key)),
  };
  const came = { nodes: new Set<string>(), segments: new Set<string>(), hazards: new Set<string>() };
  for (const c of KEYED) {
    for (const { item } of delta.came[c]) {
      // a key twice among those brought, or one the model keeps
      if (came[c].has(item.key) || (index[c].has(item.key) && !gone[c].has(item.key))) return true;
      came[c].add(item.key);
    }
  }
  const isNode = (key: string) => came.nodes.has(key) || (index.nodes.has(key) && !gone.nodes.has(key));
  const pairsGone = new Set(delta.gone.edges.map(edgePairKey));
  const pairsCame = new Set<string>();
  for (const { item: e } of delta.came.edges) {
    if (!isNode(e.from) || !isNode(e.to) || e.from === e.to) return true;
    const pair = edgePairKey(e);
    if (pairsCame.has(pair) || (index.pairs.has(pair) && !pairsGone.has(pair))) return true;
    pairsCame.add(pair);
  }
  // an edge the change left alone that names a node it took away
  const endsGone = new Map<string, number>();
  for (const e of delta.gone.edges) countEnds(endsGone, e, 1);
  for (const key of gone.nodes) {
    if (isNode(key)) continue;
    if ((index.ends.get(key) ?? 0) - (endsGone.get(key) ?? 0) > 0) return true;
  }
  return armProblems(doc.arms, isNode).length > 0;
}

/** Makes `index` describe `doc` (made from `before` by `delta`) and hands it over to it. */
function moveIndex(before: StationDocument, doc: StationDocument, index: GraphIndex, delta: Delta) {
  for (const c of KEYED) {
    for (const x of delta.gone[c]) index[c].delete(x.key);
    for (const { item } of delta.came[c]) index[c].add(item.key);
  }
  for (const e of delta.gone.edges) {
    index.pairs.delete(edgePairKey(e));
    countEnds(index.ends, e, -1);
  }
  for (const { item: e } of delta.came.edges) {
    index.pairs.add(edgePairKey(e));
    countEnds(index.ends, e, 1);
  }
  indexes.delete(before);
  indexes.set(doc, index);
}

const prefixPath = (prefix: string): PropertyKey[] =>
  prefix ? prefix.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)) : [];
