import type { CrewMember } from '../schemas/plan';
import type { RouteFeasible } from '../schemas/route';
import type { DayTask, Timeline, TimelineBlock, TimelineBlockType } from './day/types';
import type { WalkStep } from './walkthrough';

/**
 * Station notes where the work is: the notes pinned to a node, matched to the blocks of a plan's day
 * and the steps of a walkthrough that pass through or use that node. Derived from the day the engine
 * computed, nothing recomputed.
 */

/** A station note pinned to a node, as a day or walkthrough lists it. */
export interface NodeNote {
  id: number;
  nodeKey: string;
  title: string;
  body: string;
}

/** How a block uses a node. */
export type NoteUse = 'airlock' | 'route' | 'swap' | 'socket' | 'worksite' | 'arm';

/** One block of the day at a noted node. */
export interface NotePlace {
  crew: CrewMember;
  /** index into that crew member's blocks */
  block: number;
  type: TimelineBlockType;
  start: number;
  end: number;
  taskIndex?: number;
  use: NoteUse;
}

/** A note on the day: every block at its node, in time order (EV1 before EV2 at equal times). */
export interface DayNote extends NodeNote {
  places: NotePlace[];
}

type DayOfNotes = Pick<Timeline, 'crew' | 'routes'>;

/** The nodes a block passes through or uses, each once, with the first use named. */
export function blockNodes(
  block: TimelineBlock,
  routes: readonly RouteFeasible[],
  tasks: readonly Pick<DayTask, 'worksite'>[],
  airlockKey: string,
): Map<string, NoteUse> {
  const out = new Map<string, NoteUse>();
  const add = (key: string | undefined, use: NoteUse) => {
    if (key !== undefined && !out.has(key)) out.set(key, use);
  };
  switch (block.type) {
    case 'egress':
    case 'ingress':
      add(airlockKey, 'airlock');
      break;
    case 'translate': {
      const route = block.routeIndex === undefined ? undefined : routes[block.routeIndex];
      if (route) {
        const end = block.legEnd ?? route.nodes.length - 1;
        for (let k = block.legStart ?? 0; k <= end && k < route.nodes.length; k++)
          add(route.nodes[k], 'route');
      } else {
        add(block.from, 'route');
        add(block.to, 'route');
      }
      break;
    }
    case 'swap':
      add(block.swapNode, 'swap');
      add(block.releaseNode, 'swap');
      break;
    case 'arm-ride':
      add(block.from, 'arm');
      add(block.to, 'arm');
      break;
    case 'restraint-in':
    case 'restraint-out':
      add(block.socket, 'socket');
      if (block.arm) add(block.to, 'arm');
      break;
    case 'work':
      if (block.taskIndex !== undefined) add(tasks[block.taskIndex]?.worksite, 'worksite');
      add(block.socket, 'socket');
      break;
    case 'wait':
      break;
  }
  return out;
}

const CREW: readonly CrewMember[] = ['EV1', 'EV2'];

/**
 * The notes whose node the day passes through or uses, each with every block at that node, in the
 * order the day first meets them. Notes at nodes the day never uses are left out.
 */
export function notesOnDay(
  notes: readonly NodeNote[],
  timeline: DayOfNotes,
  tasks: readonly Pick<DayTask, 'worksite'>[],
  airlockKey: string,
): DayNote[] {
  const byNode = new Map<string, NodeNote[]>();
  for (const n of notes) byNode.set(n.nodeKey, [...(byNode.get(n.nodeKey) ?? []), n]);
  if (!byNode.size) return [];
  const places = new Map<number, NotePlace[]>();
  for (const crew of CREW) {
    timeline.crew[crew].blocks.forEach((block, k) => {
      for (const [node, use] of blockNodes(block, timeline.routes, tasks, airlockKey)) {
        for (const note of byNode.get(node) ?? []) {
          const list = places.get(note.id) ?? [];
          list.push({
            crew,
            block: k,
            type: block.type,
            start: block.start,
            end: block.end,
            ...(block.taskIndex === undefined ? {} : { taskIndex: block.taskIndex }),
            use,
          });
          places.set(note.id, list);
        }
      }
    });
  }
  const order = (a: NotePlace, b: NotePlace) =>
    a.start - b.start || CREW.indexOf(a.crew) - CREW.indexOf(b.crew) || a.block - b.block;
  return notes
    .filter((n) => places.has(n.id))
    .map((n) => ({ ...n, places: places.get(n.id)!.sort(order) }))
    .sort((a, b) => order(a.places[0], b.places[0]) || a.id - b.id);
}

/** The nodes a walkthrough step passes through or uses. */
export function stepNodes(step: WalkStep): string[] {
  // a wait happens where the step before it ended, which names the node already
  if (step.type === 'wait') return [];
  const keys = [
    step.fromKey,
    ...(step.via ?? []),
    step.nodeKey,
    step.clipKey,
    step.releaseKey,
    step.socketKey,
  ];
  return [...new Set(keys.filter((k): k is string => k !== undefined && k !== ''))];
}

/** A note on a walkthrough: the ids of the steps at its node, in step order. */
export interface StepNote extends NodeNote {
  steps: string[];
}

/** The notes at the nodes the steps pass through or use (notes no step touches are left out). */
export function notesOnSteps(notes: readonly NodeNote[], steps: readonly WalkStep[]): StepNote[] {
  const byNode = new Map<string, NodeNote[]>();
  for (const n of notes) byNode.set(n.nodeKey, [...(byNode.get(n.nodeKey) ?? []), n]);
  const at = new Map<number, string[]>();
  for (const step of steps)
    for (const key of stepNodes(step))
      for (const n of byNode.get(key) ?? []) {
        const list = at.get(n.id) ?? [];
        if (list[list.length - 1] !== step.id) list.push(step.id);
        at.set(n.id, list);
      }
  return notes.filter((n) => at.has(n.id)).map((n) => ({ ...n, steps: at.get(n.id)! }));
}
