import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { Vec3 } from '@shared/schemas/station';
import type { StationGraph } from '@shared/schemas/station-edits';
import { PageHeader } from '@/components/layouts/app-layout';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { PageSpinner } from '@/components/ui/spinner';
import { apiErrorMessage } from '@/lib/api-client';
import { useCan } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { cn } from '@/lib/cn';
import { paths } from '@/config/paths';
import {
  DEFAULT_LAYERS,
  SceneLegend,
  SceneToolbar,
  StationScene,
  scenePieces,
  type SceneApi,
  type SceneLayers,
  type SurfacePick,
} from '@/features/scene-3d';
import { downloadStationExport } from '@/features/stations/api/export-station';
import { getStationGraphQueryOptions, useStationGraph } from '@/features/stations/api/get-station-graph';
import { ImportStationForm } from '@/features/stations/components/import-station-form';
import { DeleteStationButton } from '@/features/stations/components/delete-station-button';
import { NodeList } from '@/features/stations/components/node-list';
import { PanelTabs } from '@/features/stations/components/panel-tabs';
import { edgesOf, type StationSelection } from '@/features/stations/components/selection';
import { SelectionDetails } from '@/features/stations/components/selection-details';
import { StationTables } from '@/features/stations/components/station-tables';
import { RouteFinderPanel, RouteOverlay, useRouteFinder } from '@/features/routes';
import { AnnotationPins, AnnotationsPanel, NOTES_PANEL_ID } from '@/features/annotations';
import { EditPanel } from '@/features/station-editor';
import { stationKeys } from '@/features/stations/api/keys';

const stationIdOf = (raw: string | undefined) => Number(raw);

const linkButtonClass = cn(
  'inline-flex h-10 items-center rounded-md border border-surface-line bg-surface-panel px-4 text-sm font-medium text-text-strong hover:bg-surface-sunken',
  focusRing,
);

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    await queryClient.ensureQueryData(getStationGraphQueryOptions(stationIdOf(params.stationId)));
    return null;
  };

/** What a plugged-in panel or overlay sees of the Station screen. */
export interface StationViewContext {
  graph: StationGraph;
  selection: StationSelection;
  select: (selection: StationSelection) => void;
  /** the last click on a segment surface (the editor snaps new nodes to it) */
  lastSurfacePick: SurfacePick | null;
  layers: SceneLayers;
  sceneApi: SceneApi;
}

export interface StationPanel {
  id: string;
  label: string;
  render: (ctx: StationViewContext) => ReactNode;
}

interface StationViewProps {
  graph: StationGraph;
  /** extra right-panel tabs after Details: edit mode, annotations, routes */
  panels?: StationPanel[];
  /** extra r3f children inside the canvas: a route, note pins */
  overlays?: ReactNode;
  /** the right-panel tab in front (the route brings one forward, e.g. when a note's pin is clicked) */
  tab: string;
  onTabChange: (id: string) => void;
  onPickSurface?: (pick: SurfacePick) => void;
}

export function StationView({
  graph,
  panels = [],
  overlays,
  tab,
  onTabChange,
  onPickSurface,
}: StationViewProps) {
  const sceneApi = useRef<SceneApi>(null);
  // `?node=KEY` (links from other screens, e.g. accepted sockets) opens with that node selected
  const [searchParams] = useSearchParams();
  const linkedNode = searchParams.get('node');
  const [selection, setSelection] = useState<StationSelection>(() =>
    linkedNode && graph.nodes.some((n) => n.key === linkedNode) ? { type: 'node', key: linkedNode } : null,
  );
  const [layers, setLayers] = useState<SceneLayers>(DEFAULT_LAYERS);
  const [lastSurfacePick, setLastSurfacePick] = useState<SurfacePick | null>(null);
  const api = useMemo<SceneApi>(
    () => ({
      fitToView: (points) => sceneApi.current?.fitToView(points),
      setPresetView: (name) => sceneApi.current?.setPresetView(name),
    }),
    [],
  );

  const positions = useMemo(() => new Map(graph.nodes.map((n) => [n.key, n.position])), [graph]);
  /** brings a node and its neighbours into view */
  const frameNode = (key: string) => {
    const near = [key, ...edgesOf(graph, key).map((e) => (e.from === key ? e.to : e.from))];
    const points = near.map((k) => positions.get(k)).filter((p): p is Vec3 => p !== undefined);
    if (points.length) api.fitToView(points);
  };
  /** selecting from the list, tables or details also frames the node */
  const focus = (next: StationSelection) => {
    setSelection(next);
    if (next?.type === 'node') frameNode(next.key);
  };
  useEffect(() => {
    if (linkedNode && positions.has(linkedNode)) frameNode(linkedNode);
    // once, when the page opens on a linked node
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const ctx: StationViewContext = {
    graph,
    selection,
    select: focus,
    lastSurfacePick,
    layers,
    sceneApi: api,
  };
  const tabs = [
    {
      id: 'details',
      label: 'Details',
      render: () => <SelectionDetails graph={graph} selection={selection} onSelect={focus} />,
    },
    ...panels.map((p) => ({ id: p.id, label: p.label, render: () => p.render(ctx) })),
  ];

  return (
    <div className="space-y-4">
      <SceneToolbar api={sceneApi} layers={layers} onLayersChange={setLayers} />
      <div className="grid gap-4 lg:grid-cols-[15rem_minmax(0,1fr)_22rem]">
        <div className="flex h-[560px] flex-col">
          <NodeList
            nodes={graph.nodes}
            selectedKey={selection?.type === 'node' ? selection.key : null}
            onSelect={(key) => focus({ type: 'node', key })}
          />
        </div>
        <StationScene
          className="h-[560px]"
          label={`3D view of ${graph.station.name}`}
          graph={graph}
          selection={selection}
          layers={layers}
          apiRef={sceneApi}
          onSelectNode={(key) => setSelection({ type: 'node', key })}
          onSelectHazard={(key) => setSelection({ type: 'hazard', key })}
          onPickSurface={(pick) => {
            setLastSurfacePick(pick);
            onPickSurface?.(pick);
          }}
          overlays={overlays}
        />
        <section
          aria-label="Selection and tools"
          className="flex h-[560px] flex-col rounded-lg border border-surface-line bg-surface-panel"
        >
          <PanelTabs label="Station panels" tabs={tabs} active={tab} onChange={onTabChange} />
        </section>
      </div>
      <SceneLegend />
      {(panels.length > 0 || overlays) && <PlanningCaution />}
      <Panel title="Tables" level={2}>
        <StationTables graph={graph} selection={selection} onSelect={focus} />
      </Panel>
    </div>
  );
}

function StationActions({ graph }: { graph: StationGraph }) {
  const canImport = useCan('stations:import');
  const canPlanSockets = useCan('sockets:save');
  const [replacing, setReplacing] = useState(false);
  const [exportError, setExportError] = useState<unknown>(null);
  const [exporting, setExporting] = useState(false);
  const { station } = graph;
  return (
    <>
      <Button
        variant="secondary"
        isLoading={exporting}
        onClick={async () => {
          setExportError(null);
          setExporting(true);
          try {
            await downloadStationExport(station.id);
          } catch (error) {
            setExportError(error);
          } finally {
            setExporting(false);
          }
        }}
      >
        Export JSON
      </Button>
      {canPlanSockets && (
        <Link className={linkButtonClass} to={paths.sockets.getHref(station.id)}>
          Plan foot-restraint sockets
        </Link>
      )}
      {canImport && (
        <Button variant="secondary" onClick={() => setReplacing(true)}>
          Replace model…
        </Button>
      )}
      {canImport && <DeleteStationButton station={station} />}
      {exportError != null && (
        <Alert tone="danger">{apiErrorMessage(exportError, 'The export failed.')}</Alert>
      )}
      <Dialog
        open={replacing}
        title={`Replace the model of ${station.name}`}
        onClose={() => setReplacing(false)}
      >
        <ImportStationForm
          target={{ mode: 'replace', stationId: station.id, version: station.version, name: station.name }}
        />
      </Dialog>
    </>
  );
}

export default function StationRoute() {
  const id = stationIdOf(useParams().stationId);
  const graph = useStationGraph(id);
  const queryClient = useQueryClient();
  const canEdit = useCan('stations:edit');
  // the note open in the Annotations tab, which a click on its pin in 3D also opens
  const [openNote, setOpenNote] = useState<number | null>(null);
  const [tab, setTab] = useState('details');
  const routeFinder = useRouteFinder(
    graph.data && {
      ...graph.data.station,
      tetherLengthM: graph.data.station.settings.tetherLengthM,
      nodes: graph.data.nodes,
    },
  );
  if (!graph.data) return <PageSpinner />;
  const { station } = graph.data;
  return (
    <>
      <PageHeader
        title={station.name}
        description={
          <>
            Version {station.version} · {station.counts.nodes} nodes, {station.counts.edges} edges,{' '}
            {station.counts.hazards} hazards, {station.counts.segments} segments · updated{' '}
            {formatDateTime(station.updatedAt)}
            {station.updatedBy && ` by ${station.updatedBy.name}`}
          </>
        }
        actions={<StationActions graph={graph.data} />}
      />
      <StationView
        graph={graph.data}
        panels={[
          {
            id: 'route',
            label: 'Route',
            render: (ctx) => <RouteFinderPanel finder={routeFinder} selection={ctx.selection} />,
          },
          ...(canEdit
            ? [
                {
                  id: 'edit',
                  label: 'Edit',
                  render: (ctx: StationViewContext) => (
                    <EditPanel
                      graph={ctx.graph}
                      selectedKey={ctx.selection?.type === 'node' ? ctx.selection.key : null}
                      onSelectNode={(key) => ctx.select(key ? { type: 'node', key } : null)}
                      pick={ctx.lastSurfacePick}
                      onChanged={() =>
                        void queryClient.invalidateQueries({ queryKey: stationKeys.graph(id) })
                      }
                    />
                  ),
                },
              ]
            : []),
          {
            id: NOTES_PANEL_ID,
            label: 'Annotations',
            render: (ctx) => (
              <AnnotationsPanel
                stationId={id}
                selectedNodeKey={ctx.selection?.type === 'node' ? ctx.selection.key : null}
                pick={ctx.lastSurfacePick}
                openId={openNote}
                onOpen={setOpenNote}
              />
            ),
          },
        ]}
        tab={tab}
        onTabChange={setTab}
        overlays={
          <>
            {routeFinder.model && (
              <RouteOverlay
                model={routeFinder.model}
                showReach={routeFinder.showReach}
                pieces={scenePieces}
              />
            )}
            <AnnotationPins
              stationId={id}
              openId={openNote}
              onOpen={(note) => {
                setOpenNote(note);
                setTab(NOTES_PANEL_ID);
              }}
            />
          </>
        }
      />
    </>
  );
}
