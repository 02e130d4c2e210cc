import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { requireUser, useUser } from '@/lib/authorization';
import { getPlanQueryOptions } from '@/features/plans/api/get-plan';
import { ChangedSinceSubmission } from '@/features/plans/components/changed-since-submission';
import { PlanEditor } from '@/features/plans/components/plan-editor';
import { StationChangeBanner } from '@/features/plans/components/station-change-banner';
import type { DayViewProps, PlanStationNodes } from '@/features/plans/types';
import { getStationGraphQueryOptions } from '@/features/stations/api/get-station-graph';
import { PlanDayPlayer } from '@/features/walkthrough/components/plan-day-player';
import { PlaybackScene } from './playback-scene';
import { usePlanPresence } from '@/features/live/live-updates';
import { PresenceList } from '@/features/live/components/presence-list';
import { PlanRuns } from '@/features/runs/components/plan-runs';
import { PlanSeriesLine } from '@/features/series/components/plan-series-line';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getPlanQueryOptions(Number(params.planId)));
    return null;
  };

/** The plan's day in 3D, on the station's model (loaded once for the route). */
function PlanDay({ timeline, plan, focus, onTime }: DayViewProps) {
  const graph = useQuery(getStationGraphQueryOptions(plan.stationId));
  if (!graph.data)
    return <PlaybackScene stationId={plan.stationId} overlays={null} apiRef={() => {}} label="" />;
  return (
    <PlanDayPlayer
      timeline={timeline}
      plan={plan}
      nodes={graph.data.nodes}
      Scene={PlaybackScene}
      focus={focus}
      onTime={onTime}
    />
  );
}

export default function PlanRoute() {
  const planId = Number(useParams().planId);
  const { data: user } = useUser();
  // signing out clears the cache while this page is still mounted: nothing is fetched without a user
  const plan = useQuery({ ...getPlanQueryOptions(planId), enabled: !!user });
  const stationId = plan.data?.stationId ?? 0;
  const graph = useQuery({ ...getStationGraphQueryOptions(stationId), enabled: !!user && stationId > 0 });
  const viewers = usePlanPresence(planId);
  if (!plan.data || !user) return <PageSpinner />;
  const nodes: PlanStationNodes | undefined = graph.data && {
    worksites: graph.data.nodes.filter((n) => n.kind === 'worksite'),
    sockets: graph.data.nodes.filter((n) => n.kind === 'socket'),
    all: graph.data.nodes,
    arms: graph.data.arms,
  };
  return (
    <div className="space-y-3">
      <StationChangeBanner plan={plan.data} />
      <ChangedSinceSubmission plan={plan.data} />
      <PlanEditor
        key={plan.data.id}
        plan={plan.data}
        user={user}
        nodes={nodes}
        orbit={graph.data?.station.orbit}
        rehearseHref={paths.walkthroughs.getHref({ planId: plan.data.id })}
        beside={
          <>
            <PlanSeriesLine planId={plan.data.id} />
            <PresenceList viewers={viewers} selfId={user.id} />
          </>
        }
        aside={
          plan.data.status === 'approved' && <PlanRuns planId={plan.data.id} runHref={paths.run.getHref} />
        }
        DayView={PlanDay}
      />
    </div>
  );
}
