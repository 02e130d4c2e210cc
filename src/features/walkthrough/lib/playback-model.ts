import { describeSwap } from '@shared/compute/day/describe';
import { stepAt, type CrewTrack, type WalkStep } from '@shared/compute/walkthrough';
import type { OrbitWindow } from '@shared/compute/orbit';
import type { Vec3 } from '@shared/schemas/station';
import type { WalkthroughPlayback } from '@shared/schemas/walkthrough';

export type LaneId = 'EV1' | 'EV2' | 'crew';

/** One person being played back: a plan has EV1 and EV2, a route alone has one crew member. */
export interface Lane {
  id: LaneId;
  /** "EV1 (Ana)" or "Crew member" */
  label: string;
  short: string;
  track: CrewTrack;
  tetherLengthM: number;
}

export interface ListedStep {
  step: WalkStep;
  lane: LaneId;
  /** 1-based place in the merged list: the `?step=N` of a shared link */
  number: number;
}

export function lanesOf(playback: WalkthroughPlayback): Lane[] {
  if (playback.kind === 'route') {
    return [
      {
        id: 'crew',
        label: 'Crew member',
        short: 'Crew',
        track: playback.track,
        tetherLengthM: playback.tetherLengthM,
      },
    ];
  }
  return (['EV1', 'EV2'] as const).map((id) => ({
    id,
    label: `${id} (${playback.crewNames[id]})`,
    short: id,
    track: playback.crews[id],
    tetherLengthM: playback.tetherLengthM[id],
  }));
}

/** Every lane's steps on the shared clock, by start time; a lane's own order is kept on ties. */
export function mergeSteps(lanes: readonly Lane[]): ListedStep[] {
  const all = lanes.flatMap((lane) => lane.track.steps.map((step) => ({ step, lane: lane.id })));
  all.sort((a, b) => a.step.start - b.step.start);
  return all.map((s, i) => ({ ...s, number: i + 1 }));
}

/** The step each lane has under way at `t`, as indices into that lane's own steps. */
export function currentStepIndices(lanes: readonly Lane[], t: number): number[] {
  return lanes.map((lane) => stepAt(lane.track.steps, t));
}

const EPS = 1e-6;

/** Distinct step start times, ascending: the events "next" and "previous" jump between. */
export function eventTimes(steps: readonly ListedStep[]): number[] {
  const out: number[] = [];
  for (const s of steps) if (!out.length || s.step.start > out[out.length - 1] + EPS) out.push(s.step.start);
  return out;
}

export function nextEventTime(times: readonly number[], t: number): number | null {
  return times.find((x) => x > t + EPS) ?? null;
}

export function previousEventTime(times: readonly number[], t: number): number | null {
  for (let i = times.length - 1; i >= 0; i--) if (times[i] < t - EPS) return times[i];
  return null;
}

/** What a trainer reads out for a step. */
export function stepCallout(step: WalkStep): string {
  switch (step.type) {
    case 'swap': {
      const words = describeSwap(step.clipKey ?? step.nodeKey, step.releaseKey ?? step.anchorKey);
      return `${words.title}: ${words.instruction}`;
    }
    // on an arm's end there is no socket: the step's own title says which arm and where
    case 'restraint-in':
      return step.socketKey
        ? `Foot restraint in: set the restraint on socket ${step.socketKey} and get in`
        : step.title;
    case 'restraint-out':
      return step.socketKey
        ? `Foot restraint out: get out of the restraint on socket ${step.socketKey}`
        : step.title;
    case 'work':
      return step.socketKey
        ? `${step.title} — working from the foot restraint on ${step.socketKey}`
        : step.title;
    default:
      return step.title;
  }
}

export const STEP_TYPE_LABELS: Record<WalkStep['type'], string> = {
  start: 'Start',
  egress: 'Egress',
  translate: 'Translate',
  swap: 'Tether swap',
  'restraint-in': 'Restraint in',
  work: 'Work',
  'restraint-out': 'Restraint out',
  wait: 'Wait',
  ingress: 'Ingress',
  arrive: 'Arrive',
  'arm-ride': 'On the arm',
};

export function isNight(windows: readonly OrbitWindow[], t: number): boolean {
  return windows.some((w) => w.kind === 'night' && t >= w.start - EPS && t < w.end - EPS);
}

/** The points a lane's track passes through, in order, without repeats of a standing point. */
export function trackPath(track: CrewTrack, untilSeconds = Infinity): Vec3[] {
  const out: Vec3[] = [];
  const push = (p: Vec3) => {
    const last = out[out.length - 1];
    if (!last || last[0] !== p[0] || last[1] !== p[1] || last[2] !== p[2]) out.push(p);
  };
  for (const piece of track.pieces) {
    if (piece.t0 > untilSeconds + EPS) break;
    push(piece.from);
    if (piece.t1 <= untilSeconds + EPS) push(piece.to);
  }
  return out;
}

export const SPEEDS = [1, 10, 60, 300] as const;
export type Speed = (typeof SPEEDS)[number];
