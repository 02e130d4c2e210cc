import { useCallback, useEffect, useRef } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { SidePanel, useSidePanelState, Workspace } from '@/components/layouts/workspace';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { PageSpinner } from '@/components/ui/spinner';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api-client';
import { requireUser } from '@/lib/authorization';
import { getPlanQueryOptions } from '@/features/plans/api/get-plan';
import { usePlans } from '@/features/plans/api/get-plans';
import { SceneToolbar, StationScene, scenePieces, type SceneApi } from '@/features/scene-3d';
import { getStationGraphQueryOptions, useStationGraph } from '@/features/stations/api/get-station-graph';
import { stationKeys } from '@/features/stations/api/keys';
import {
  SocketPlanResults,
  SocketPlannerControls,
  SocketPlannerOverlay,
  useSocketPlanner,
  YawPitchDiagram,
  type SocketPlannerStation,
} from '@/features/sockets';
import type { StationGraph } from '@shared/schemas/station-edits';

function stationIdOf(params: { stationId?: string }): number {
  const id = Number(params.stationId);
  if (!Number.isInteger(id) || id <= 0) throw new ApiError(404, 'NOT_FOUND', 'There is no such station.');
  return id;
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getStationGraphQueryOptions(stationIdOf(params)));
    return null;
  };

function SocketPlannerPage({ graph }: { graph: StationGraph }) {
  const queryClient = useQueryClient();
  const stationId = graph.station.id;
  const plans = usePlans({ stationId });
  const station: SocketPlannerStation = {
    id: stationId,
    version: graph.station.version,
    reach: graph.station.settings.reach,
    nodes: graph.nodes,
  };
  const loadPlanWorksites = useCallback(
    async (planId: number) =>
      (await queryClient.fetchQuery(getPlanQueryOptions(planId))).tasks.map((t) => t.worksite),
    [queryClient],
  );
  const sceneApi = useRef<SceneApi>(null);
  const [panelOpen, setPanelOpen] = useSidePanelState(0);
  const planner = useSocketPlanner(station, { invalidates: [stationKeys.graph(stationId)] });

  const { focus } = planner;
  useEffect(() => {
    if (focus) sceneApi.current?.fitToView(focus);
  }, [focus]);

  return (
    <>
      <PageHeader
        compact
        title="Socket planner"
        description={
          <>
            The fewest foot-restraint sockets that bring every chosen target within reach on{' '}
            <TextLink to={paths.station.getHref(stationId)}>{graph.station.name}</TextLink> (version{' '}
            {graph.station.version}).
          </>
        }
      />
      <Workspace
        right={
          <SidePanel
            title="Plan sockets"
            side="right"
            open={panelOpen}
            onOpenChange={setPanelOpen}
            className="w-[26rem]"
          >
            <div className="relative min-h-0 flex-1 space-y-5 overflow-y-auto p-4">
              <SocketPlannerControls
                planner={planner}
                plans={plans.data ?? []}
                loadPlanWorksites={loadPlanWorksites}
              />
              <section aria-label="Result" className="space-y-2 border-t border-surface-line pt-4">
                <h2 className="text-base font-semibold text-text-strong">Result</h2>
                {planner.run ? (
                  <SocketPlanResults
                    planner={planner}
                    nodeHref={(key) => `${paths.station.getHref(stationId)}?node=${encodeURIComponent(key)}`}
                    onReload={() =>
                      void queryClient.invalidateQueries({ queryKey: stationKeys.graph(stationId) })
                    }
                  />
                ) : (
                  <p className="text-sm text-text-muted">
                    Choose targets and plan: the result shows here and in 3D.
                  </p>
                )}
              </section>
              <section aria-label="Restraint angles" className="space-y-2 border-t border-surface-line pt-4">
                <h2 className="text-base font-semibold text-text-strong">Restraint angles</h2>
                <YawPitchDiagram />
              </section>
              <PlanningCaution className="px-3 py-2 text-xs" />
              <p className="text-xs text-text-muted">
                The reach stand-off and radius are planning defaults from memory, not verified suited
                work-envelope dimensions.
              </p>
            </div>
          </SidePanel>
        }
      >
        <SceneToolbar api={sceneApi} />
        <div className="relative min-h-0 flex-1">
          <StationScene
            graph={graph}
            apiRef={sceneApi}
            label={`3D view of ${graph.station.name} with the planned sockets and their work envelopes`}
            className={planner.picking ? 'h-full cursor-crosshair ring-2 ring-accent' : 'h-full'}
            onPickSurface={(pick) => void planner.pickSurface(pick)}
            overlays={<SocketPlannerOverlay planner={planner} pieces={scenePieces} />}
          />
          {planner.picking && (
            <p
              role="status"
              className="absolute top-2 left-2 rounded-md bg-surface-panel/95 px-3 py-1.5 text-sm text-accent-strong shadow"
            >
              Click a truss or module surface to add a target point there.
            </p>
          )}
        </div>
      </Workspace>
    </>
  );
}

export default function StationSocketsRoute() {
  const stationId = stationIdOf(useParams());
  const graph = useStationGraph(stationId);
  if (!graph.data) return <PageSpinner />;
  return <SocketPlannerPage graph={graph.data} />;
}
