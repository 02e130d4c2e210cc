import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  flownEstimateFor,
  flownEstimates,
  taskKind,
  type FlownRun,
} from '@shared/compute/day/flown-estimates';
import type { FlightEvent } from '@shared/compute/day/run';

const tasks = [
  { id: 1, title: 'Open the cover', worksite: 'W1' },
  { id: 2, title: 'Swap the pump', worksite: 'W2' },
  { id: 3, title: 'Open the cover', worksite: 'W3' },
];

/** A run where task `id` (EV1) was started at `start` and logged done `seconds` later. */
const flight = (id: number, start: number, seconds: number): FlightEvent[] => [
  { crew: 'EV1', kind: 'task-start', taskId: id, at: start },
  { crew: 'EV1', kind: 'task-done', taskId: id, at: start + seconds },
];

describe('flown durations as estimates', () => {
  it('suggests the median of the flights of the same task at the same worksite (worked by hand)', () => {
    const runs: FlownRun[] = [
      { tasks, events: flight(1, 1000, 600) },
      { tasks, events: [...flight(1, 900, 1200), ...flight(3, 3000, 300)] },
      { tasks: [{ id: 7, title: '  open the COVER #2', worksite: 'W1' }], events: flight(7, 500, 900) },
    ];
    const estimates = flownEstimates(runs);
    expect(estimates).toEqual([
      // 600, 900, 1200 → 900; the title as last flown
      {
        title: '  open the COVER #2',
        worksite: 'W1',
        flights: 3,
        seconds: 900,
        minSeconds: 600,
        maxSeconds: 1200,
      },
      { title: 'Open the cover', worksite: 'W3', flights: 1, seconds: 300, minSeconds: 300, maxSeconds: 300 },
    ]);
    expect(flownEstimateFor(estimates, 'Open the cover 3', 'W1')?.seconds).toBe(900);
    expect(flownEstimateFor(estimates, 'Open the cover', 'W2')).toBeUndefined();
    expect(flownEstimateFor(estimates, '', 'W1')).toBeUndefined();
    // two flights: the mean of the middle two
    expect(
      flownEstimates([
        { tasks, events: flight(2, 0, 600) },
        { tasks, events: flight(2, 0, 700) },
      ])[0].seconds,
    ).toBe(650);
  });

  it('takes a task for both from the first start to the last done, and the last log of each', () => {
    const events: FlightEvent[] = [
      { crew: 'EV1', kind: 'task-start', taskId: 2, at: 100 },
      { crew: 'EV2', kind: 'task-start', taskId: 2, at: 160 },
      { crew: 'EV1', kind: 'task-done', taskId: 2, at: 700 },
      { crew: 'EV2', kind: 'task-done', taskId: 2, at: 800 },
      // a corrected log of EV1's done replaces the first one
      { crew: 'EV1', kind: 'task-done', taskId: 2, at: 750 },
    ];
    expect(flownEstimates([{ tasks, events }])[0]).toMatchObject({ flights: 1, seconds: 700 });
  });

  it('takes nothing from a task never logged done, or done before its start', () => {
    const events: FlightEvent[] = [
      { crew: 'EV1', kind: 'task-start', taskId: 1, at: 100 },
      { crew: 'EV1', kind: 'task-start', taskId: 2, at: 500 },
      { crew: 'EV1', kind: 'task-done', taskId: 2, at: 400 },
      { crew: 'EV1', kind: 'note', taskId: 3, at: 600 },
    ];
    expect(flownEstimates([{ tasks, events }])).toEqual([]);
  });

  it('one kind: case, spacing and a trailing number do not count', () => {
    expect(taskKind('Swap  the Pump #2')).toBe('swap the pump');
    expect(taskKind('swap the pump no. 3')).toBe('swap the pump');
    expect(taskKind('Swap the pump')).toBe('swap the pump');
  });

  it('the estimate lies between the shortest and the longest flight, whatever the order of the runs (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 20_000 }), { minLength: 1, maxLength: 12 }),
        (lengths) => {
          const runs = lengths.map((s) => ({ tasks, events: flight(1, 100, s) }));
          const [e] = flownEstimates(runs);
          const [r] = flownEstimates([...runs].reverse());
          expect(e).toEqual(r);
          expect(e.flights).toBe(lengths.length);
          expect(e.minSeconds).toBe(Math.min(...lengths));
          expect(e.maxSeconds).toBe(Math.max(...lengths));
          expect(e.seconds).toBeGreaterThanOrEqual(e.minSeconds);
          expect(e.seconds).toBeLessThanOrEqual(e.maxSeconds);
        },
      ),
    );
  });
});
