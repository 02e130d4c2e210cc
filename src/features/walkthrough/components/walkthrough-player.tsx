import { useCallback, useEffect, useMemo, useRef, useState, type ComponentType, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { Vec3 } from '@shared/schemas/station';
import type { WalkthroughDetail, WalkthroughPlayback } from '@shared/schemas/walkthrough';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { useCan } from '@/lib/authorization';
import { useUpdateWalkthrough } from '../api/update-walkthrough';
import { createPlaybackClock, useClock } from '../lib/playback-clock';
import { currentStepIndices, eventTimes, lanesOf, mergeSteps } from '../lib/playback-model';
import { DayState } from './day-state';
import { PlaybackControls, TetherGauges } from './playback-controls';
import { PRINT_CSS, StepCards } from './step-cards';
import { StepCallout, StepList, currentStepOf, type CurrentSteps } from './step-list';
import { WalkthroughOverlays } from './walkthrough-overlays';

function usePlaybackModel(playback: WalkthroughPlayback) {
  return useMemo(() => {
    const lanes = lanesOf(playback);
    const steps = mergeSteps(lanes);
    return { lanes, steps, times: eventTimes(steps) };
  }, [playback]);
}

function CopyLinkButton({ href }: { href: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'manual'>('idle');
  const url = `${window.location.origin}${href}`;
  return (
    <span className="inline-flex items-center gap-2">
      <Button
        variant="secondary"
        onClick={() =>
          navigator.clipboard
            ?.writeText(url)
            .then(() => setState('copied'))
            .catch(() => setState('manual')) ?? setState('manual')
        }
      >
        Copy link
      </Button>
      <span aria-live="polite" className="text-sm text-text-muted">
        {state === 'copied' && 'Link copied.'}
        {state === 'manual' && (
          <input
            readOnly
            aria-label="Link to this step"
            value={url}
            className="w-64 rounded border border-surface-line px-2 py-1 text-xs"
            onFocus={(e) => e.target.select()}
          />
        )}
      </span>
    </span>
  );
}

interface WalkthroughPlayerProps {
  detail: WalkthroughDetail;
  /** the step cards for printing instead of the playback (which stays mounted under them) */
  printView: boolean;
  /**
   * The station in 3D with the playback's overlays drawn in it, handed in by the route (the scene is
   * another feature's); `apiRef` lets the playback frame the crew.
   */
  Scene: ComponentType<PlaybackSceneProps>;
}

export interface PlaybackSceneProps {
  stationId: number;
  overlays: ReactNode;
  apiRef: SceneFramingRef;
  label: string;
  /** the arms the overlays move (the scene leaves them out of its arms at rest) */
  movingArms?: readonly string[];
}

/** What the playback asks of the 3D scene: to bring points into view. */
export interface SceneFraming {
  fitToView: (points: Vec3[]) => void;
}
/** A callback ref, so a scene whose handle offers more than framing fits it. */
export type SceneFramingRef = (scene: SceneFraming | null) => void;

/** A walkthrough played back: the 3D view, the clock, the tether gauges and the steps with notes. */
export function WalkthroughPlayer({ detail, printView, Scene }: WalkthroughPlayerProps) {
  const { walkthrough } = detail;
  const playback = detail.playback!;
  const [searchParams, setSearchParams] = useSearchParams();
  const canEdit = useCan('walkthroughs:edit');
  const { lanes, steps, times } = usePlaybackModel(playback);
  const startStep = Number(searchParams.get('step'));
  const startAt = steps[startStep - 1]?.step.start ?? 0;
  // a new clock only for another plan/station version, so saving a note does not rewind playback
  const clockKey = `${walkthrough.id}:${detail.currentVersion}:${playback.endSeconds}`;
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const clock = useMemo(() => createPlaybackClock(playback.endSeconds, { startAt }), [clockKey]);
  useEffect(() => () => clock.dispose(), [clock]);

  const indexKey = useClock(clock, (c) => currentStepIndices(lanes, c.t).join(','));
  const current: CurrentSteps = useMemo(
    () => ({ lanes, indices: indexKey.split(',').map(Number) }),
    [lanes, indexKey],
  );
  const currentNumber = steps.find((s) => s.step.id === currentStepOf(current, 0)?.id)?.number;
  const sceneApi = useRef<SceneFraming | null>(null);
  const setSceneApi = useCallback((scene: SceneFraming | null) => {
    sceneApi.current = scene;
  }, []);
  const frame = useCallback((points: Vec3[]) => sceneApi.current?.fitToView(points), []);
  const rebase = useUpdateWalkthrough();

  // the playback stays mounted under the print view, so coming back keeps the scene and the clock
  return (
    <>
      {printView && (
        <div data-print-root>
          <style>{PRINT_CSS}</style>
          <div className="mb-4 flex flex-wrap items-center justify-between gap-3" data-print-hide>
            <p className="text-sm text-text-muted">
              One card per step. Print on A4 or Letter; two cards to a row.
            </p>
            <div className="flex gap-2">
              <Button onClick={() => window.print()}>Print</Button>
              <Button
                variant="secondary"
                onClick={() =>
                  setSearchParams((p) => {
                    p.delete('print');
                    return p;
                  })
                }
              >
                Back to playback
              </Button>
            </div>
          </div>
          <h1 className="text-xl font-semibold text-text-strong">Step cards: {walkthrough.name}</h1>
          <p className="mb-2 text-sm text-text-muted">
            {walkthrough.plan
              ? `Plan "${walkthrough.plan.title}" (version ${detail.currentVersion})`
              : `Route ${walkthrough.route?.from} → ${walkthrough.route?.to}`}{' '}
            · {walkthrough.stationName} · {steps.length} steps
          </p>
          <PlanningCaution className="mb-3" />
          <StepCards
            title={walkthrough.name}
            steps={steps}
            lanes={lanes}
            notes={walkthrough.notes}
            positions={playback.positions}
          />
        </div>
      )}
      <div hidden={printView}>
        {detail.changedSince && (
          <Alert tone="caution" title="Changed since the notes were written" className="mb-4">
            {detail.notice}
            {canEdit && (
              <div className="mt-2">
                <Button
                  size="sm"
                  variant="secondary"
                  isLoading={rebase.isPending}
                  onClick={() =>
                    rebase.mutate({
                      id: walkthrough.id,
                      data: { version: walkthrough.version, rebase: true },
                    })
                  }
                >
                  Notes checked: accept the current version
                </Button>
              </div>
            )}
            {rebase.error && (
              <p className="mt-2 font-semibold">
                {isApiError(rebase.error) ? rebase.error.message : 'Could not save.'}
              </p>
            )}
          </Alert>
        )}
        <div className="mb-4 flex flex-wrap items-center gap-2">
          <CopyLinkButton href={paths.walkthrough.getHref(walkthrough.id, { step: currentNumber })} />
          <Button variant="secondary" onClick={() => setSearchParams({ print: '1' })}>
            Print cards
          </Button>
        </div>
        <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_400px]">
          <div className="min-w-0 space-y-3">
            <Scene
              stationId={walkthrough.stationId}
              apiRef={setSceneApi}
              label={`3D playback of ${walkthrough.name}`}
              movingArms={playback.kind === 'plan' ? playback.arms?.map((a) => a.key) : undefined}
              overlays={
                <WalkthroughOverlays
                  clock={clock}
                  lanes={lanes}
                  positions={playback.positions}
                  {...(playback.kind === 'plan'
                    ? { equipment: playback.equipment, normals: playback.normals, arms: playback.arms }
                    : {})}
                  onFrame={frame}
                />
              }
            />
            <StepCallout current={current} />
            <PlaybackControls
              clock={clock}
              lanes={lanes}
              eventTimes={times}
              nightWindows={playback.nightWindows}
            />
            <Panel title="Tether">
              <TetherGauges clock={clock} lanes={lanes} />
            </Panel>
            {playback.kind === 'plan' && (
              <Panel title="At this moment">
                <DayState clock={clock} lanes={lanes} equipment={playback.equipment} arms={playback.arms} />
              </Panel>
            )}
            {playback.warnings.length > 0 && (
              <Alert tone="caution">
                <details>
                  <summary className="cursor-pointer rounded font-semibold focus-visible:outline-2 focus-visible:outline-accent">
                    {playback.warnings.length} warning{playback.warnings.length === 1 ? '' : 's'} from the{' '}
                    {playback.kind === 'plan' ? 'plan' : 'route'}
                  </summary>
                  <ul className="mt-2 list-disc pl-5">
                    {playback.warnings.map((w) => (
                      <li key={w}>{w}</li>
                    ))}
                  </ul>
                </details>
              </Alert>
            )}
          </div>
          <Panel title={`Steps (${steps.length})`} className="self-start">
            <div className="-mx-5 -my-4">
              <StepList
                steps={steps}
                current={current}
                notes={walkthrough.notes}
                walkthroughId={walkthrough.id}
                version={walkthrough.version}
                canEdit={canEdit}
                onSeek={(s) => {
                  clock.pause();
                  clock.seek(s.step.start);
                }}
              />
            </div>
          </Panel>
        </div>
      </div>
    </>
  );
}
