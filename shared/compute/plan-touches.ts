import type { StationDocument, StationEdge, Vec3 } from '../schemas/station';
import { segmentIntersectsHazard } from './geometry';
import type { DayItem, DayPlan, Timeline } from './day/types';
import { membersOf, socketFor } from './day/timeline';
import { sameValue } from './station-changes';

/** What a plan stands on in a station: the nodes it names, and the ways its day's routes take. */
export interface PlanFootprint {
  /** node key → what the plan uses it for ("worksite of task 3", "on the route of task 2 (EV1)") */
  nodes: Map<string, string[]>;
  /** unordered pair `a|b` of a route's consecutive nodes → which routes */
  ways: Map<string, string[]>;
}

/** One station change that touches a plan: what changed, and what of the plan it touches. */
export interface PlanTouch {
  what: 'node' | 'edge' | 'hazard' | 'settings' | 'orbit';
  /** the node or hazard key, or the edge as `from–to (kind)` */
  id: string;
  change: 'added' | 'removed' | 'changed';
  touches: string[];
}

const pairId = (a: string, b: string) => (a < b ? `${a}|${b}` : `${b}|${a}`);
const note = (map: Map<string, string[]>, key: string, use: string) => {
  const list = map.get(key) ?? [];
  if (!list.includes(use)) list.push(use);
  map.set(key, list);
};

/** The nodes and ways a plan's day uses: worksites, sockets, item places, and every route's steps. */
export function planFootprint(
  plan: Pick<DayPlan, 'tasks'> & { manifest: readonly Pick<DayItem, 'name' | 'startsAt' | 'installedAt'>[] },
  timeline: Timeline,
): PlanFootprint {
  const nodes = new Map<string, string[]>();
  const ways = new Map<string, string[]>();
  plan.tasks.forEach((task, i) => {
    note(nodes, task.worksite, `worksite of task ${i + 1}`);
    for (const m of membersOf(task)) {
      const socket = socketFor(task, m);
      if (socket) note(nodes, socket, `socket of task ${i + 1} (${m})`);
    }
    for (const a of task.actions) if (a.at) note(nodes, a.at, `where task ${i + 1} acts on ${a.item}`);
  });
  for (const item of plan.manifest) {
    const place = item.installedAt ?? item.startsAt;
    if (place && place !== 'airlock') note(nodes, place, `where ${item.name} starts`);
  }
  for (const m of ['EV1', 'EV2'] as const) {
    for (const block of timeline.crew[m].blocks) {
      if (block.type !== 'translate' || block.routeIndex === undefined) continue;
      const route = timeline.routes[block.routeIndex];
      const use =
        block.taskIndex === undefined
          ? `${m}'s way back to the airlock`
          : `route to task ${block.taskIndex + 1} (${m})`;
      for (let k = block.legStart ?? 0; k < (block.legEnd ?? route.nodes.length - 1); k++) {
        note(nodes, route.nodes[k], use);
        note(nodes, route.nodes[k + 1], use);
        note(ways, pairId(route.nodes[k], route.nodes[k + 1]), use);
      }
    }
  }
  return { nodes, ways };
}

const edgeName = (e: StationEdge) => `${e.from}–${e.to} (${e.kind})`;
const uniq = (xs: string[]) => [...new Set(xs)];

/**
 * The changes from station document `before` to `after` that touch a plan's footprint: a node it
 * uses removed or changed (moved, made another kind), a way its routes take removed, closed or
 * changed, a hazard added, changed or removed whose volume (before or after) crosses one of its
 * routes or holds one of its nodes, and the station's settings or orbit (every time and night
 * window of the day follows them). Segments only draw the model and never touch a plan.
 */
export function planTouches(before: StationDocument, after: StationDocument, fp: PlanFootprint): PlanTouch[] {
  const out: PlanTouch[] = [];
  const beforeNodes = new Map(before.nodes.map((n) => [n.key, n]));
  const afterNodes = new Map(after.nodes.map((n) => [n.key, n]));
  for (const [key, uses] of fp.nodes) {
    const a = beforeNodes.get(key);
    const b = afterNodes.get(key);
    if (a && !b) out.push({ what: 'node', id: key, change: 'removed', touches: uses });
    else if (a && b && !sameValue(a, b))
      out.push({ what: 'node', id: key, change: 'changed', touches: uses });
  }
  const byPair = (doc: StationDocument) => {
    const m = new Map<string, StationEdge[]>();
    for (const e of doc.edges) {
      const k = pairId(e.from, e.to);
      if (fp.ways.has(k)) m.set(k, [...(m.get(k) ?? []), e]);
    }
    return m;
  };
  const beforeWays = byPair(before);
  const afterWays = byPair(after);
  for (const [k, edges] of beforeWays) {
    const now = afterWays.get(k) ?? [];
    for (const e of edges) {
      const same = now.find((x) => x.kind === e.kind);
      if (!same) out.push({ what: 'edge', id: edgeName(e), change: 'removed', touches: fp.ways.get(k)! });
      else if (!sameValue(e, same))
        out.push({ what: 'edge', id: edgeName(e), change: 'changed', touches: fp.ways.get(k)! });
    }
  }
  // a route's stretches and the plan's points, as positions of the version the plan was computed on
  const at = (key: string): Vec3 | undefined => (beforeNodes.get(key) ?? afterNodes.get(key))?.position;
  const stretches: { a: Vec3; b: Vec3; uses: string[] }[] = [];
  for (const [k, uses] of fp.ways) {
    const [p, q] = k.split('|');
    const a = at(p);
    const b = at(q);
    if (a && b) stretches.push({ a, b, uses });
  }
  const beforeHazards = new Map(before.hazards.map((h) => [h.key, h]));
  const afterHazards = new Map(after.hazards.map((h) => [h.key, h]));
  for (const key of new Set([...beforeHazards.keys(), ...afterHazards.keys()])) {
    const a = beforeHazards.get(key);
    const b = afterHazards.get(key);
    if (a && b && sameValue(a, b)) continue;
    const touches: string[] = [];
    for (const h of [a, b]) {
      if (!h) continue;
      for (const s of stretches) if (segmentIntersectsHazard(s.a, s.b, h)) touches.push(...s.uses);
      for (const [node, uses] of fp.nodes) {
        const p = at(node);
        if (p && segmentIntersectsHazard(p, p, h)) touches.push(...uses);
      }
    }
    if (touches.length)
      out.push({
        what: 'hazard',
        id: key,
        change: !a ? 'added' : !b ? 'removed' : 'changed',
        touches: uniq(touches),
      });
  }
  if (!sameValue(before.settings, after.settings))
    out.push({
      what: 'settings',
      id: 'settings',
      change: 'changed',
      touches: ['every translation, swap and restraint time of the day'],
    });
  if (!sameValue(before.orbit, after.orbit))
    out.push({ what: 'orbit', id: 'orbit', change: 'changed', touches: ['the night windows of the day'] });
  return out;
}

/** One line for a list: "node W3 removed: worksite of task 3; route to task 3 (EV1)". */
export function describeTouch(t: PlanTouch): string {
  const what = t.what === 'settings' || t.what === 'orbit' ? `station ${t.what}` : `${t.what} ${t.id}`;
  return `${what} ${t.change}: ${t.touches.join('; ')}`;
}
