import {
  ArmSchema,
  checkStationGraphRules,
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
} from '../schemas/station';
import { applyStationChange, COLLECTIONS, type Collection, type StationChange } from './station-changes';
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
 * and the graph rules on the whole model (keys, edge ends, twins and arms: lookups, a few
 * milliseconds at 10k nodes, where the schemas take tens). Also answers the
 * new document, which shares the untouched items with `before`: neither may be mutated.
 */
export function changeProblems(
  before: StationDocument,
  change: StationChange,
): { doc: StationDocument; problems: DocumentProblem[] } {
  const doc = applyStationChange(before, change, { share: true });
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
    if (c === 'arms' || !change[c]) continue;
    const old = new Set<unknown>(before[c]);
    (doc[c] as unknown[]).forEach((item, i) => {
      if (old.has(item)) return;
      const parsed = ITEM_SCHEMA[c].safeParse(item);
      if (!parsed.success) parsed.error.issues.forEach(issue(`${c}.${i}`));
    });
  }
  const over = Object.entries(STATION_LIMITS).filter(
    ([c, max]) => doc[c as keyof typeof STATION_LIMITS].length > max,
  );
  // a collection past its size is what the whole schema reports first: leave it to the full check
  if (over.length) return { doc, problems: changeProblemsFull(before, change) };
  return { doc, problems: [...problems, ...checkStationGraphRules(doc)] };
}

const prefixPath = (prefix: string): PropertyKey[] =>
  prefix ? prefix.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)) : [];
