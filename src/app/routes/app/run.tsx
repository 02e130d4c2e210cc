import { useMemo } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import { Panel } from '@/components/ui/card';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { requireUser, useCan, useUser } from '@/lib/authorization';
import { PresenceList } from '@/features/live/components/presence-list';
import { usePlanPresence } from '@/features/live/live-updates';
import { getRunQueryOptions } from '@/features/runs/api/get-run';
import { PlannedStart, RunClock, useElapsed } from '@/features/runs/components/run-clock';
import { RunLanes } from '@/features/runs/components/run-lanes';
import { RunLogger } from '@/features/runs/components/run-logger';
import { RunSummary } from '@/features/runs/components/run-summary';
import { getStationGraphQueryOptions } from '@/features/stations/api/get-station-graph';
import { PlanDayPlayer } from '@/features/walkthrough/components/plan-day-player';
import { PlaybackScene } from './playback-scene';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getRunQueryOptions(Number(params.runId)));
    return null;
  };

/** The 3D model moves with the clock to where the re-projected day has each crew member now. */
const FOCUS_STEP_S = 15;

/** The day of the EVA, for a wall display and a laptop: clock, lanes, one-key logging, the model now. */
export default function RunRoute() {
  const runId = Number(useParams().runId);
  const { data: user } = useUser();
  const canFly = useCan('runs:fly');
  const run = useQuery({ ...getRunQueryOptions(runId), enabled: !!user });
  const view = run.data;
  const elapsed = useElapsed(view?.run.startedAt ?? new Date().toISOString());
  const viewers = usePlanPresence(view?.plan.id ?? null);
  const stationId = view?.plan.stationId ?? 0;
  const graph = useQuery({ ...getStationGraphQueryOptions(stationId), enabled: !!user && stationId > 0 });
  const now = Math.max(elapsed, view?.now ?? 0);
  const focusAt = Math.floor(now / FOCUS_STEP_S) * FOCUS_STEP_S;
  const focus = useMemo(() => ({ crew: 'EV1' as const, start: focusAt, end: focusAt + 60 }), [focusAt]);
  const dayTimeline = useMemo(
    () =>
      view && {
        ...view.projected,
        planId: view.plan.id,
        planVersion: view.run.planVersion,
        stationId: view.plan.stationId,
        stationVersion: 0,
        airlockKey: view.airlockKey,
        caution: view.caution,
      },
    [view],
  ) as PlanTimeline | undefined;
  if (!view || !user) return <PageSpinner />;
  const titleOf = (i: number | undefined) => (i === undefined ? '' : (view.plan.tasks[i]?.title ?? ''));
  const crewNames = { EV1: view.plan.crew.EV1.name, EV2: view.plan.crew.EV2.name };
  return (
    <div className="space-y-4 pb-4">
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold text-text-strong">
            Run {view.run.id}: {view.plan.title}
          </h1>
          <p className="text-sm text-text-muted">
            <Link className="underline" to={paths.plan.getHref(view.plan.id)}>
              The plan
            </Link>{' '}
            ·{' '}
            <a className="underline" href={`/api/runs/${view.run.id}/export.csv`} download>
              As flown (CSV)
            </a>{' '}
            ·{' '}
            <a className="underline" href={`/api/runs/${view.run.id}/export.pdf`} download>
              As flown (PDF)
            </a>{' '}
            · {view.events.length} logged · started {view.run.startedAt.slice(0, 19).replace('T', ' ')} GMT
            {view.plan.startGmt && <PlannedStart planned={view.plan.startGmt} started={view.run.startedAt} />}
          </p>
          <PresenceList viewers={viewers} selfId={user.id} />
        </div>
        <RunClock startedAt={view.run.startedAt} elapsed={elapsed} />
      </header>
      {canFly && <RunLogger run={view} elapsed={elapsed} />}
      <Panel title="Crew lanes">
        <RunLanes
          now={now}
          planned={{ EV1: view.planned.crew.EV1.blocks, EV2: view.planned.crew.EV2.blocks }}
          projected={{ EV1: view.projected.crew.EV1.blocks, EV2: view.projected.crew.EV2.blocks }}
          actual={view.actual}
          titleOf={titleOf}
          crewNames={crewNames}
          startedAt={view.run.startedAt}
        />
      </Panel>
      <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
        <Panel title="Where each crew member should be now">
          {graph.data && dayTimeline ? (
            <PlanDayPlayer
              timeline={dayTimeline}
              plan={view.plan}
              nodes={graph.data.nodes}
              Scene={PlaybackScene}
              focus={focus}
            />
          ) : (
            <PlaybackScene stationId={stationId} overlays={null} apiRef={() => {}} label="" />
          )}
        </Panel>
        <Panel title="The rest of the day">
          <RunSummary view={view} />
        </Panel>
      </div>
      <PlanningCaution />
    </div>
  );
}
