import { describe, expect, it } from 'vitest';
import { nextRunStep } from '@shared/compute/day/run-steps';
import type { FlightEvent } from '@shared/compute/day/run';

const tasks = [
  { id: 1, title: 'Open the cover', crew: 'EV1' as const },
  { id: 2, title: 'Swap the pump', crew: 'both' as const },
  { id: 3, title: 'Inspect the site', crew: 'EV2' as const },
];
const step = (events: FlightEvent[], crew: 'EV1' | 'EV2') => {
  const s = nextRunStep(tasks, events, crew);
  return s && [s.kind, s.taskId ?? null];
};

describe('the one key of each crew member (worked by hand)', () => {
  it('walks egress, each own task start then done in plan order, then ingress', () => {
    const log: FlightEvent[] = [];
    expect(step(log, 'EV1')).toEqual(['egress-done', null]);
    log.push({ crew: 'EV1', kind: 'egress-done', at: 600 });
    expect(step(log, 'EV1')).toEqual(['task-start', 1]);
    expect(step(log, 'EV2')).toEqual(['egress-done', null]);
    log.push({ crew: 'EV1', kind: 'task-start', taskId: 1, at: 700 });
    expect(step(log, 'EV1')).toEqual(['task-done', 1]);
    log.push({ crew: 'EV1', kind: 'task-done', taskId: 1, at: 900 });
    expect(step(log, 'EV1')).toEqual(['task-start', 2]);
  });

  it('counts a joint task logged by either member for both, and ingress for both', () => {
    const log: FlightEvent[] = [
      { crew: 'EV1', kind: 'egress-done', at: 600 },
      { crew: 'EV2', kind: 'egress-done', at: 610 },
      { crew: 'EV1', kind: 'task-start', taskId: 1, at: 700 },
      { crew: 'EV1', kind: 'task-done', taskId: 1, at: 900 },
      { crew: 'EV1', kind: 'task-start', taskId: 2, at: 950 },
    ];
    expect(step(log, 'EV2')).toEqual(['task-done', 2]);
    log.push({ crew: 'EV2', kind: 'task-done', taskId: 2, at: 1500 });
    expect(step(log, 'EV1')).toEqual(['ingress-start', null]);
    expect(step(log, 'EV2')).toEqual(['task-start', 3]);
    log.push({ crew: 'EV1', kind: 'ingress-start', at: 1600 });
    expect(step(log, 'EV2')).toEqual(['ingress-done', null]);
    log.push({ crew: 'EV2', kind: 'ingress-done', at: 2000 });
    expect(step(log, 'EV1')).toBeNull();
  });
});
