import { useCallback, useEffect, useMemo, useRef, useState, type ComponentType, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { Vec3 } from '@shared/schemas/station';
import { formatElapsed } from '@shared/compute/units';
import type { WalkthroughDetail, WalkthroughPlayback } from '@shared/schemas/walkthrough';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PanelTabs } from '@/components/ui/panel-tabs';
import { SidePanel, useSidePanelState, Workspace } from '@/components/layouts/workspace';
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
import { StationNoteLines, stationNotesByStep } from './station-note-lines';
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
  /** the scene's size (a fixed height unless its container sizes it) */
  className?: string;
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
  const [panelOpen, setPanelOpen] = useSidePanelState(0);
  const [tab, setTab] = useState('steps');
  const notesByStep = useMemo(() => stationNotesByStep(detail.stationNotes ?? []), [detail.stationNotes]);
  const stepById = new Map(steps.map((s) => [s.step.id, s]));
  const tabs = [
    {
      id: 'steps',
      label: `Steps (${steps.length})`,
      render: () => (
        <StepList
          steps={steps}
          current={current}
          notes={walkthrough.notes}
          walkthroughId={walkthrough.id}
          version={walkthrough.version}
          canEdit={canEdit}
          stationNotes={notesByStep}
          onSeek={(s) => {
            clock.pause();
            clock.seek(s.step.start);
          }}
        />
      ),
    },
    ...(detail.stationNotes?.length
      ? [
          {
            id: 'station-notes',
            label: `Station notes (${detail.stationNotes.length})`,
            render: () => (
              <ul className="space-y-3 p-3 text-sm" aria-label="Station notes on this walkthrough">
                {detail.stationNotes.map((n) => (
                  <li key={n.id} className="space-y-1" data-station-note={n.id}>
                    <StationNoteLines notes={[n]} withBody />
                    <div className="flex flex-wrap gap-1.5">
                      {n.steps.map((id) => {
                        const s = stepById.get(id);
                        return (
                          s && (
                            <Button
                              key={id}
                              size="sm"
                              variant="secondary"
                              className="h-7 px-2 text-xs"
                              onClick={() => {
                                clock.pause();
                                clock.seek(s.step.start);
                                setTab('steps');
                              }}
                            >
                              Step {s.number} · {formatElapsed(s.step.start)}
                            </Button>
                          )
                        );
                      })}
                    </div>
                  </li>
                ))}
              </ul>
            ),
          },
        ]
      : []),
    ...(playback.kind === 'plan'
      ? [
          {
            id: 'now',
            label: 'At this moment',
            render: () => (
              <div className="p-3">
                <DayState clock={clock} lanes={lanes} equipment={playback.equipment} arms={playback.arms} />
              </div>
            ),
          },
        ]
      : []),
    ...(playback.warnings.length > 0
      ? [
          {
            id: 'warnings',
            label: `Warnings (${playback.warnings.length})`,
            render: () => (
              <ul
                className="list-disc space-y-1 p-3 pl-8 text-sm text-text"
                aria-label={`Warnings from the ${playback.kind === 'plan' ? 'plan' : 'route'}`}
              >
                {playback.warnings.map((w) => (
                  <li key={w}>{w}</li>
                ))}
              </ul>
            ),
          },
        ]
      : []),
  ];

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
        <Workspace
          right={
            <SidePanel
              title="Steps and state"
              side="right"
              open={panelOpen}
              onOpenChange={setPanelOpen}
              className="w-[26rem]"
            >
              {/* on a short window the steps keep a usable height and the panel scrolls instead */}
              <div className="relative flex min-h-0 flex-1 flex-col overflow-y-auto">
                <div className="shrink-0 space-y-3 border-b border-surface-line p-3">
                  <StepCallout current={current} stationNotes={notesByStep} />
                  <TetherGauges clock={clock} lanes={lanes} />
                </div>
                <div className="flex min-h-72 flex-1 flex-col">
                  <PanelTabs label="Walkthrough panels" tabs={tabs} active={tab} onChange={setTab} flush />
                </div>
              </div>
              <PlanningCaution className="m-2 shrink-0 px-3 py-2 text-xs" />
            </SidePanel>
          }
        >
          <div className="flex flex-wrap items-center gap-2">
            <CopyLinkButton href={paths.walkthrough.getHref(walkthrough.id, { step: currentNumber })} />
            <Button size="sm" variant="secondary" onClick={() => setSearchParams({ print: '1' })}>
              Print cards
            </Button>
          </div>
          <div className="min-h-0 flex-1">
            <Scene
              stationId={walkthrough.stationId}
              apiRef={setSceneApi}
              label={`3D playback of ${walkthrough.name}`}
              movingArms={playback.kind === 'plan' ? playback.arms?.map((a) => a.key) : undefined}
              className="h-full"
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
          </div>
          <PlaybackControls
            clock={clock}
            lanes={lanes}
            eventTimes={times}
            nightWindows={playback.nightWindows}
          />
        </Workspace>
      </div>
    </>
  );
}
