import type { CrewMember } from '../../schemas/plan';
import type { DayItem, DayTask, TetherState, TimelineBlock } from './types';

const VERBS = {
  'pick-up': 'picks up',
  'set-down': 'sets down',
  install: 'installs',
  remove: 'removes',
  'hand-over': 'hands over',
} as const;

/** "EV1 installs foot restraint A at PB3-S2", in the words a cue card uses. */
export function describeAction(
  task: Pick<DayTask, 'crew' | 'worksite' | 'socket' | 'sockets'>,
  action: DayTask['actions'][number],
  items: readonly (Pick<DayItem, 'key' | 'name'> & Partial<Pick<DayItem, 'kind'>>)[],
): string {
  const by: CrewMember = action.by ?? (task.crew === 'both' ? 'EV1' : task.crew);
  const item = items.find((m) => m.key === action.item);
  const name = item?.name ?? action.item;
  if (action.do === 'hand-over') return `${by} hands ${name} to ${by === 'EV1' ? 'EV2' : 'EV1'}`;
  // as the timeline places it: a restraint goes into (or out of) the member's socket, the rest at the worksite
  const socket =
    item?.kind === 'foot-restraint' && (action.do === 'install' || action.do === 'remove')
      ? task.crew === 'both'
        ? task.sockets?.[by]
        : task.socket
      : undefined;
  const at = action.at ?? socket ?? task.worksite;
  const where = action.do === 'pick-up' || action.do === 'remove' ? `from ${at}` : `at ${at}`;
  return `${by} ${VERBS[action.do]} ${name} ${where}`;
}

/** The tether state at the end of each block of one crew member's day (egress starts clipped at the airlock). */
export function tetherAfterBlocks(blocks: readonly TimelineBlock[], airlockKey: string): TetherState[] {
  let tether: TetherState = { anchor: airlockKey, paidOutM: 0 };
  return blocks.map((b) => {
    // translate blocks, and getting on and off an arm (tethered to the arm, then clipped back)
    if (b.tetherAtEnd) tether = b.tetherAtEnd;
    else if (b.type === 'swap' && b.swapNode) tether = { anchor: b.swapNode, paidOutM: 0 };
    return tether;
  });
}

/**
 * A tether swap in the words a cue card uses. Make before break: the new hook is clipped, then the
 * old one released. A swap whose new and old attach point are the same is a re-clip there (the
 * crew member came back to the point they are clipped to, and starts counting the tether afresh).
 */
export function describeSwap(clip: string, release: string): { title: string; instruction: string } {
  if (clip === release) {
    return {
      title: `Tether re-clip at ${clip}`,
      instruction: `re-clip at ${clip}: clip the second hook at ${clip} beside the first, then release the first`,
    };
  }
  return {
    title: `Tether swap at ${clip}`,
    instruction: `clip the new hook at ${clip}, then release the old one at ${release}`,
  };
}
