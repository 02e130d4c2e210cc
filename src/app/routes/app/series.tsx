import { useEffect, useMemo, useRef, useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { EquipmentTrack } from '@shared/compute/day/types';
import type { PlanListItem } from '@shared/schemas/plan-views';
import type { SeriesListItem, SeriesView } from '@shared/schemas/series';
import type { Vec3 } from '@shared/schemas/station';
import { PageHeader } from '@/components/layouts/app-layout';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { PageSpinner } from '@/components/ui/spinner';
import { requireUser, useCan, useUser } from '@/lib/authorization';
import { StationScene, type SceneApi } from '@/features/scene-3d';
import { getPlansQueryOptions } from '@/features/plans/api/get-plans';
import { getSeriesListQueryOptions, getSeriesQueryOptions } from '@/features/series/api/get-series';
import { AddEva, EvaControls, useSeriesEdit } from '@/features/series/components/series-editor';
import { SeriesStrip } from '@/features/series/components/series-strip';
import { useStationGraph } from '@/features/stations/api/get-station-graph';
import { ItemsLayer } from '@/features/walkthrough/components/items-layer';
import { createPlaybackClock } from '@/features/walkthrough/lib/playback-clock';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getSeriesQueryOptions(Number(params.seriesId)));
    return null;
  };

/**
 * What stays outside after one EVA of the series, on the station model: each item drawn where the
 * EVA left it (a restraint stood in its socket, a bag at its node), as the walkthrough draws items.
 */
function OutsideOnModel({ series, stationId }: { series: SeriesView; stationId: number }) {
  const graph = useStationGraph(stationId);
  const [after, setAfter] = useState(0);
  const sceneApi = useRef<SceneApi>(null);
  // items that never move: one state each, so a clock standing at 0 shows them all
  const clock = useMemo(() => createPlaybackClock(1), []);
  useEffect(() => () => clock.dispose(), [clock]);
  const shown = Math.min(after, series.evas.length - 1);
  const items = useMemo(() => series.evas[shown]?.outsideAfter ?? [], [series, shown]);
  const equipment = useMemo<EquipmentTrack[]>(
    () =>
      items.map((o) => ({
        item: o.item,
        name: o.name,
        kind: o.kind,
        states: [{ start: 0, end: 1, where: o.where }],
      })),
    [items],
  );
  const nodes = graph.data?.nodes;
  const { positions, normals, size } = useMemo(() => {
    const positions: Record<string, Vec3> = {};
    const normals: Record<string, Vec3> = {};
    let lo = [Infinity, Infinity, Infinity];
    let hi = [-Infinity, -Infinity, -Infinity];
    for (const n of nodes ?? []) {
      positions[n.key] = n.position;
      if (n.normal) normals[n.key] = n.normal;
      lo = lo.map((v, i) => Math.min(v, n.position[i]));
      hi = hi.map((v, i) => Math.max(v, n.position[i]));
    }
    const extent = nodes?.length ? Math.max(...hi.map((v, i) => v - lo[i])) : 0;
    return { positions, normals, size: Math.min(1.2, Math.max(0.25, extent / 90)) };
  }, [nodes]);
  // frame what is outside (with some room round it), or the whole station when nothing is
  useEffect(() => {
    const points = items
      .map((o) => ('node' in o.where ? positions[o.where.node] : undefined))
      .filter((p): p is Vec3 => p !== undefined);
    const id = setTimeout(() => {
      if (points.length)
        sceneApi.current?.fitToView(
          points.flatMap((p) => [
            p,
            [p[0] + 4, p[1] + 4, p[2] + 4] as Vec3,
            [p[0] - 4, p[1] - 4, p[2] - 4] as Vec3,
          ]),
        );
    }, 80);
    return () => clearTimeout(id);
  }, [items, positions]);

  if (!graph.data) return <PageSpinner />;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Show what stays outside">
        {series.evas.map((eva, i) => (
          <Button
            key={eva.planId}
            size="sm"
            variant={i === shown ? 'primary' : 'secondary'}
            aria-pressed={i === shown}
            onClick={() => setAfter(i)}
          >
            After EVA {i + 1}
          </Button>
        ))}
        <span className="text-sm text-text-muted" aria-live="polite">
          {items.length === 0
            ? `Nothing stays outside after EVA ${shown + 1}.`
            : `${items.length} item${items.length === 1 ? '' : 's'} outside after EVA ${shown + 1}: ${items
                .map(
                  (o) =>
                    `${o.name} ${o.where.kind === 'installed' ? 'installed at' : 'at'} ${'node' in o.where ? o.where.node : ''}`,
                )
                .join('; ')}`}
        </span>
      </div>
      <StationScene
        graph={graph.data}
        apiRef={sceneApi}
        label={`What stays outside after EVA ${shown + 1}, on ${graph.data.station.name}`}
        className="h-[480px]"
        overlays={
          <ItemsLayer
            equipment={equipment}
            clock={clock}
            lanes={[]}
            positions={positions}
            normals={normals}
            size={size}
          />
        }
      />
    </div>
  );
}

export default function SeriesRoute() {
  const seriesId = Number(useParams().seriesId);
  const { data: user } = useUser();
  const canEdit = useCan('plans:edit');
  const series = useQuery({ ...getSeriesQueryOptions(seriesId), enabled: !!user });
  const plans = useQuery({ ...getPlansQueryOptions(), enabled: !!user && canEdit });
  const allSeries = useQuery({ ...getSeriesListQueryOptions(), enabled: !!user && canEdit });
  if (!series.data) return <PageSpinner />;
  return (
    <SeriesScreen series={series.data} canEdit={canEdit} plans={plans.data} allSeries={allSeries.data} />
  );
}

function SeriesScreen({
  series,
  canEdit,
  plans,
  allSeries,
}: {
  series: SeriesView;
  canEdit: boolean;
  plans?: PlanListItem[];
  allSeries?: SeriesListItem[];
}) {
  const edit = useSeriesEdit(series);
  const taken = new Set((allSeries ?? []).flatMap((s) => s.planIds));
  const candidates = (plans ?? []).filter((p) => p.stationId === series.stationId && !taken.has(p.id));
  return (
    <>
      <PageHeader
        title={series.title}
        description="EVAs planned as a series: each starts with the items where the one before left them."
      />
      <Panel title="EVAs and what stays outside between them">
        <SeriesStrip
          series={series}
          controls={
            canEdit ? (i) => <EvaControls edit={edit} index={i} count={series.evas.length} /> : undefined
          }
        />
        {canEdit && (
          <div className="mt-4">
            <AddEva edit={edit} candidates={candidates} />
          </div>
        )}
      </Panel>
      {series.stationId !== null && series.evas.length > 0 && (
        <Panel title="What stays outside, on the model">
          <PlanningCaution />
          <OutsideOnModel series={series} stationId={series.stationId} />
        </Panel>
      )}
    </>
  );
}
