import { describe, expect, it } from 'vitest';
import { describeAction } from '@shared/compute/day/describe';

const items = [
  { key: 'pfr', name: 'Foot restraint', kind: 'foot-restraint' as const },
  { key: 'bag', name: 'Parts bag', kind: 'bag' as const },
];

describe('describeAction: where a cue card says an action happens (worked by hand from the timeline rule)', () => {
  const task = { crew: 'EV1' as const, worksite: 'W1', socket: 'S1' };

  it('a restraint is installed in the member’s socket; anything else is set down at the worksite', () => {
    expect(describeAction(task, { do: 'install', item: 'pfr' }, items)).toBe(
      'EV1 installs Foot restraint at S1',
    );
    expect(describeAction(task, { do: 'set-down', item: 'bag' }, items)).toBe(
      'EV1 sets down Parts bag at W1',
    );
    expect(describeAction(task, { do: 'pick-up', item: 'bag', at: 'J4' }, items)).toBe(
      'EV1 picks up Parts bag from J4',
    );
  });

  it('in a task for both, the acting member’s own socket; a hand-over names the partner', () => {
    const both = { crew: 'both' as const, worksite: 'W1', sockets: { EV1: 'S1', EV2: 'S2' } };
    expect(describeAction(both, { do: 'remove', item: 'pfr', by: 'EV2' }, items)).toBe(
      'EV2 removes Foot restraint from S2',
    );
    expect(describeAction(both, { do: 'hand-over', item: 'bag', by: 'EV2' }, items)).toBe(
      'EV2 hands Parts bag to EV1',
    );
  });
});
