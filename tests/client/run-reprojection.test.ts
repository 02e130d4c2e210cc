import { describe, expect, it } from 'vitest';
import { REPROJECT_MS, reprojectIn, type RunScreenData } from '@/features/runs/api/get-run';

const START = '2031-03-14T08:00:00Z';
const viewWith = (clock: RunScreenData['clock']) =>
  ({ run: { startedAt: START }, clock }) as unknown as RunScreenData;
const at = (elapsed: number) => Date.parse(START) + elapsed * 1000;

describe('re-projecting the run as time passes', () => {
  it('re-projects every few seconds while the clock holds a step at now', () => {
    expect(reprojectIn(viewWith({ held: true, steadyUntil: null }), at(5000))).toBe(REPROJECT_MS);
  });

  it('waits until the clock reaches the moment the projection would start to move', () => {
    // steady until 1:40:00 elapsed; it is 1:30:00: ten minutes and a half second on
    expect(reprojectIn(viewWith({ held: false, steadyUntil: 6000 }), at(5400))).toBe(600_500);
    // already due (a late answer): soon, never in a tight loop
    expect(reprojectIn(viewWith({ held: false, steadyUntil: 6000 }), at(6100))).toBe(1000);
    // a run opened ahead of its start checks again within the hour
    expect(reprojectIn(viewWith({ held: false, steadyUntil: 600 }), at(-86_400))).toBe(3_600_000);
  });

  it('never re-projects on a timer when nothing left can be held by the clock', () => {
    expect(reprojectIn(viewWith({ held: false, steadyUntil: null }), at(5000))).toBe(false);
    expect(reprojectIn(undefined)).toBe(false);
  });
});
