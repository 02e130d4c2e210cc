import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { act, render, screen } from '@testing-library/react';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { computeTimeline } from '@shared/compute/day/timeline';
import { dayStationOf } from '@shared/compute/day/station';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { planWalkthrough, routeWalkthrough, stepAt } from '@shared/compute/walkthrough';
import type { RouteFeasible } from '@shared/schemas/route';
import type { Vec3 } from '@shared/schemas/station';
import type { PlanPlayback } from '@shared/schemas/walkthrough';
import { StepCards } from '@/features/walkthrough/components/step-cards';
import { createPlaybackClock, useClock, type PlaybackClock } from '@/features/walkthrough/lib/playback-clock';
import {
  currentStepIndices,
  eventTimes,
  lanesOf,
  mergeSteps,
  nextEventTime,
  previousEventTime,
  stepCallout,
} from '@/features/walkthrough/lib/playback-model';

const doc = generateTrussStation({ nodes: 400, seed: 11 });
const compiled = compileStation(doc);
const positions = Object.fromEntries(doc.nodes.map((n) => [n.key, n.position as Vec3]));
const position = (k: string) => positions[k];
const airlock = doc.nodes.find((n) => n.kind === 'airlock')!.key;
const worksites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);

const route = (from: string, to: string, mode: 'fastest' | 'fewest-swaps' | 'balanced', tether: number) =>
  findRoute(compiled, doc.settings, { from, to, mode, tetherLengthM: tether });
const station = dayStationOf(doc, compiled)!;

function planPlayback(
  tasks: { worksite: string; crew: 'EV1' | 'EV2' | 'both'; durationSeconds: number }[],
): PlanPlayback {
  const full = tasks.map((t, i) => ({
    ...t,
    title: `Task ${i + 1}`,
    eclipseOnly: false,
    carrying: false,
    tools: [],
    actions: [],
  }));
  const timeline = computeTimeline(
    {
      crew: { EV1: { name: 'A', tetherLengthM: 12 }, EV2: { name: 'B', tetherLengthM: 20 } },
      routeMode: 'balanced',
      allowRide: false,
      orbitPhaseAtStartDeg: 0,
      timeLimitSeconds: 23400,
      egressSeconds: 1800,
      ingressSeconds: 1800,
      tasks: full,
      manifest: [],
    },
    station,
    (request) => findRoute(compiled, doc.settings, request),
  );
  const walk = planWalkthrough(timeline, full, airlock, position);
  return {
    kind: 'plan',
    crews: walk.crews,
    crewNames: { EV1: 'A', EV2: 'B' },
    tetherLengthM: { EV1: 12, EV2: 20 },
    endSeconds: walk.endSeconds,
    timeLimitSeconds: 23400,
    airlockKey: airlock,
    nightWindows: timeline.nightWindows,
    positions,
    equipment: timeline.equipment,
    normals: {},
    warnings: [],
  };
}

const taskArb = fc.record({
  worksite: fc.constantFrom(...worksites),
  crew: fc.constantFrom('EV1' as const, 'EV2' as const, 'both' as const),
  durationSeconds: fc.integer({ min: 60, max: 3600 }),
});

describe('walkthrough playback model', () => {
  it('merges both crews’ steps on one clock: sorted, each step once, each lane in its own order', () => {
    fc.assert(
      fc.property(fc.array(taskArb, { minLength: 1, maxLength: 4 }), (tasks) => {
        const lanes = lanesOf(planPlayback(tasks));
        const merged = mergeSteps(lanes);
        const all = lanes.flatMap((l) => l.track.steps);
        expect(merged.map((s) => s.step.id).sort()).toEqual(all.map((s) => s.id).sort());
        merged.forEach((s, i) => {
          expect(s.number).toBe(i + 1);
          if (i > 0) expect(s.step.start).toBeGreaterThanOrEqual(merged[i - 1].step.start);
        });
        for (const lane of lanes) {
          expect(merged.filter((s) => s.lane === lane.id).map((s) => s.step.id)).toEqual(
            lane.track.steps.map((s) => s.id),
          );
        }
        // next/previous walk the distinct start times, and the steps under way follow stepAt
        const times = eventTimes(merged);
        times.forEach((t, i) => {
          expect(nextEventTime(times, t)).toBe(times[i + 1] ?? null);
          expect(previousEventTime(times, t)).toBe(times[i - 1] ?? null);
          expect(currentStepIndices(lanes, t)).toEqual(lanes.map((l) => stepAt(l.track.steps, t)));
        });
      }),
      { numRuns: 25 },
    );
  });

  it('calls out a swap by its clip and release points as the engine placed them', () => {
    const r = worksites
      .map((w) => route(airlock, w, 'fastest', 8))
      .find((x): x is RouteFeasible => x.feasible && x.swapCount > 0)!;
    expect(r).toBeTruthy();
    const track = routeWalkthrough(r, position);
    const swaps = track.steps.filter((s) => s.type === 'swap');
    const clips = [r.nodes[0], ...r.swaps.map((s) => s.node)];
    swaps.forEach((s, i) => {
      expect(stepCallout(s)).toBe(
        `Tether swap at ${r.swaps[i].node}: clip the new hook at ${r.swaps[i].node}, then release the old one at ${clips[i]}`,
      );
    });
  });
});

describe('playback clock', () => {
  function manualClock(end: number) {
    let now = 0;
    let pending: (() => void) | null = null;
    const clock = createPlaybackClock(end, {
      speed: 60,
      now: () => now,
      requestFrame: (cb) => {
        pending = cb;
        return 1;
      },
      cancelFrame: () => {
        pending = null;
      },
    });
    const frame = (ms: number) => {
      now += ms;
      const cb = pending;
      pending = null;
      cb?.();
    };
    return { clock, frame };
  }

  it('advances by elapsed wall time × speed, stops at the end, and clamps seeks', () => {
    const { clock, frame } = manualClock(600);
    clock.play();
    frame(1000);
    expect(clock.t).toBeCloseTo(60, 9);
    clock.setSpeed(300);
    frame(500);
    expect(clock.t).toBeCloseTo(210, 9);
    frame(10_000);
    expect(clock.t).toBe(600);
    expect(clock.playing).toBe(false);
    clock.seek(-5);
    expect(clock.t).toBe(0);
    clock.seek(1e9);
    expect(clock.t).toBe(600);
  });

  it('re-renders a subscriber only when the selected step changes, not on every frame', async () => {
    const track = routeWalkthrough(
      worksites
        .map((w) => route(airlock, w, 'fastest', 8))
        .find((x): x is RouteFeasible => x.feasible && x.swapCount > 0)!,
      position,
    );
    const { clock, frame } = manualClock(track.endSeconds);
    clock.setSpeed(1);
    let renders = 0;
    function Probe({ c }: { c: PlaybackClock }) {
      const index = useClock(c, (x) => stepAt(track.steps, x.t));
      renders++;
      return <span data-testid="index">{index}</span>;
    }
    render(<Probe c={clock} />);
    const before = renders;
    const seen = new Set<number>();
    await act(async () => {
      clock.play();
      for (let i = 0; i < 400; i++) {
        frame(1000 * (track.endSeconds / 400));
        seen.add(stepAt(track.steps, clock.t));
      }
    });
    // hundreds of frames, but only as many renders as step changes
    expect(renders - before).toBeLessThanOrEqual(seen.size);
    expect(renders - before).toBeGreaterThan(0);
    expect(screen.getByTestId('index').textContent).toBe(String(stepAt(track.steps, clock.t)));
  });
});

describe('printable step cards', () => {
  it('render one card per step with its diagram and the trainer note', () => {
    const playback = planPlayback([
      { worksite: worksites[0], crew: 'EV1', durationSeconds: 600 },
      { worksite: worksites[1 % worksites.length], crew: 'both', durationSeconds: 900 },
    ]);
    const lanes = lanesOf(playback);
    const steps = mergeSteps(lanes);
    const noted = steps[3].step.id;
    const { container } = render(
      <StepCards
        title="Test day"
        steps={steps}
        lanes={lanes}
        notes={{ [noted]: 'Watch the cable' }}
        positions={positions}
      />,
    );
    const cards = screen.getAllByTestId('step-card');
    expect(cards.length).toBe(steps.length);
    cards.forEach((card) => expect(card.querySelector('svg')).not.toBeNull());
    expect(cards[3].textContent).toContain('Trainer note: Watch the cable');
    expect(container.textContent).toContain('This is a planning aid');
  });
});
