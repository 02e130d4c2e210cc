import { useCallback, useEffect, useMemo, useRef, type ComponentType } from 'react';
import { planPlaybackOf, type PlaybackNode } from '@shared/compute/plan-playback';
import { sampleTrack } from '@shared/compute/walkthrough';
import type { CrewMember, Plan } from '@shared/schemas/plan';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { Vec3 } from '@shared/schemas/station';
import { createPlaybackClock, useClock } from '../lib/playback-clock';
import { eventTimes, lanesOf, mergeSteps } from '../lib/playback-model';
import { DayState } from './day-state';
import { PlaybackControls, TetherGauges } from './playback-controls';
import type { PlaybackSceneProps, SceneFraming } from './walkthrough-player';
import { WalkthroughOverlays } from './walkthrough-overlays';

/** A stretch of the day to go to and bring into view, e.g. a block picked on the timeline chart. */
export interface DayFocus {
  crew: CrewMember;
  start: number;
  end: number;
}

interface PlanDayPlayerProps {
  timeline: PlanTimeline;
  plan: Pick<Plan, 'tasks' | 'crew' | 'stationId'>;
  /** the station's nodes: where each key is, and the sockets' normals */
  nodes: readonly PlaybackNode[];
  Scene: ComponentType<PlaybackSceneProps>;
  focus?: DayFocus | null;
  /** the clock's time, now and then (often enough for a cursor on a chart) */
  onTime?: (t: number) => void;
}

const FRAME_SAMPLES = 8;
const FRAME_PAD_M = 2;

/**
 * The plan's day in 3D on a clock: crew markers, live tether lines, items and installed restraints
 * where the timeline has them, with a scrubber and the state at that moment in words. Everything is
 * derived from the timeline the server computed; nothing is computed again.
 */
export function PlanDayPlayer({ timeline, plan, nodes, Scene, focus, onTime }: PlanDayPlayerProps) {
  const playback = useMemo(
    () => planPlaybackOf(timeline, plan, timeline.airlockKey, nodes),
    [timeline, plan, nodes],
  );
  const { lanes, times } = useMemo(() => {
    const l = lanesOf(playback);
    return { lanes: l, times: eventTimes(mergeSteps(l)) };
  }, [playback]);
  const clock = useMemo(() => createPlaybackClock(playback.endSeconds), [playback.endSeconds]);
  useEffect(() => () => clock.dispose(), [clock]);

  const sceneApi = useRef<SceneFraming | null>(null);
  const setSceneApi = useCallback((scene: SceneFraming | null) => {
    sceneApi.current = scene;
  }, []);
  const frame = useCallback((points: Vec3[]) => sceneApi.current?.fitToView(points), []);

  useEffect(() => {
    if (!focus) return;
    clock.pause();
    clock.seek(focus.start);
    const lane = lanes.find((l) => l.id === focus.crew);
    if (!lane) return;
    const points: Vec3[] = [];
    for (let i = 0; i <= FRAME_SAMPLES; i++) {
      const [x, y, z] = sampleTrack(
        lane.track,
        focus.start + ((focus.end - focus.start) * i) / FRAME_SAMPLES,
      ).position;
      points.push(
        [x - FRAME_PAD_M, y - FRAME_PAD_M, z - FRAME_PAD_M],
        [x + FRAME_PAD_M, y + FRAME_PAD_M, z + FRAME_PAD_M],
      );
    }
    frame(points);
  }, [focus, clock, lanes, frame, playback.positions]);

  // a coarse time for the chart's cursor: a few updates a second while playing
  const coarse = useClock(clock, (c) => Math.round(c.t / 10) * 10);
  useEffect(() => onTime?.(clock.t), [coarse, clock, onTime]);

  return (
    // side by side where the player itself is wide enough, whatever the window: it may sit in a column
    <div className="@container" data-testid="plan-day">
      <div className="grid gap-4 @4xl:grid-cols-[minmax(0,1fr)_360px]">
        <div className="min-w-0 space-y-3">
          <Scene
            stationId={plan.stationId}
            apiRef={setSceneApi}
            label="The day in 3D: crew, tethers, items and foot restraints at the scrubber's time"
            movingArms={playback.arms?.map((a) => a.key)}
            overlays={
              <WalkthroughOverlays
                clock={clock}
                lanes={lanes}
                positions={playback.positions}
                equipment={playback.equipment}
                normals={playback.normals}
                arms={playback.arms}
                onFrame={frame}
              />
            }
          />
          <PlaybackControls
            clock={clock}
            lanes={lanes}
            eventTimes={times}
            nightWindows={playback.nightWindows}
          />
        </div>
        <div className="space-y-4">
          <TetherGauges clock={clock} lanes={lanes} />
          <DayState clock={clock} lanes={lanes} equipment={playback.equipment} arms={playback.arms} />
        </div>
      </div>
    </div>
  );
}
