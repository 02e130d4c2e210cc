import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { graphArraysOf } from '@shared/compute/graph-columns';
import type { StationGraph } from '@shared/schemas/station-edits';
import { PageHeader } from '@/components/layouts/app-layout';
import { SidePanel, useSidePanelState, Workspace } from '@/components/layouts/workspace';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
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
import { ImportCsvForm } from '@/features/stations/components/import-csv-form';
import { DeleteStationButton } from '@/features/stations/components/delete-station-button';
import { NodeList } from '@/features/stations/components/node-list';
import { PanelTabs } from '@/components/ui/panel-tabs';
import { selectionPoints, type StationSelection } from '@/features/stations/components/selection';
import { SelectionDetails } from '@/features/stations/components/selection-details';
import { StationTables } from '@/features/stations/components/station-tables';
import { RouteFinderPanel, RouteOverlay, useRouteFinder } from '@/features/routes';
import { AnnotationPins, AnnotationsPanel, NOTES_PANEL_ID } from '@/features/annotations';
import { EditPanel } from '@/features/station-editor';
import { stationKeys } from '@/features/stations/api/keys';

const stationIdOf = (raw: string | undefined) => Number(raw);
const TABLES_ID = 'station-tables';
/** below this window width the side panel starts folded, leaving the width to the 3D view */
const RIGHT_PANEL_MIN_WINDOW_PX = 960;

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
  // the nodes in columns: the finder and the scene read them without an object per node
  const arrays = graphArraysOf(graph);
  const [selection, setSelection] = useState<StationSelection>(() =>
    linkedNode && arrays.keys.includes(linkedNode) ? { type: 'node', key: linkedNode } : null,
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

  /** brings a selection into view: a node with its neighbours, an edge, a hazard's volume */
  const frame = (next: StationSelection) => {
    const points = selectionPoints(graph, next);
    if (points.length) api.fitToView(points);
  };
  /** selecting from the list, tables or details also frames the selection */
  const focus = (next: StationSelection) => {
    setSelection(next);
    frame(next);
  };
  useEffect(() => {
    if (selection) frame(selection);
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

  const [panelOpen, setPanelOpen] = useSidePanelState(RIGHT_PANEL_MIN_WINDOW_PX);
  const [tablesOpen, setTablesOpen] = useState(false);
  return (
    <Workspace
      right={
        <SidePanel
          title="Selection and tools"
          side="right"
          open={panelOpen}
          onOpenChange={setPanelOpen}
          className="w-[22rem]"
        >
          <div className="flex min-h-0 flex-1 flex-col">
            <PanelTabs label="Station panels" tabs={tabs} active={tab} onChange={onTabChange} />
          </div>
          {(panels.length > 0 || overlays) && <PlanningCaution className="m-2 shrink-0 px-3 py-2 text-xs" />}
        </SidePanel>
      }
    >
      <SceneToolbar
        api={sceneApi}
        layers={layers}
        onLayersChange={setLayers}
        onFrameSelection={selection ? () => frame(selection) : undefined}
      >
        <Button
          size="sm"
          variant={tablesOpen ? 'primary' : 'secondary'}
          aria-expanded={tablesOpen}
          aria-controls={TABLES_ID}
          onClick={() => setTablesOpen(!tablesOpen)}
        >
          Tables
        </Button>
      </SceneToolbar>
      <div className="relative min-h-0 flex-1">
        <StationScene
          className="h-full"
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
        <NodeList
          floating
          className="absolute top-2 left-2 z-10 w-80 max-w-[calc(100%-1rem)]"
          arrays={arrays}
          selectedKey={selection?.type === 'node' ? selection.key : null}
          onSelect={(key) => focus({ type: 'node', key })}
        />
      </div>
      {tablesOpen && (
        <section
          id={TABLES_ID}
          aria-label="Tables"
          className="flex h-[45%] min-h-56 shrink-0 flex-col rounded-lg border border-surface-line bg-surface-panel"
        >
          <div className="flex items-center justify-between border-b border-surface-line py-1 pr-1 pl-4">
            <h2 className="text-sm font-semibold text-text-strong">Tables</h2>
            <Button size="sm" variant="ghost" onClick={() => setTablesOpen(false)}>
              Close tables
            </Button>
          </div>
          <div className="relative flex min-h-0 flex-1 flex-col px-4 py-3">
            <StationTables graph={graph} selection={selection} onSelect={focus} />
          </div>
        </section>
      )}
    </Workspace>
  );
}

function StationActions({ graph }: { graph: StationGraph }) {
  const canImport = useCan('stations:import');
  const canPlanSockets = useCan('sockets:save');
  const [replacing, setReplacing] = useState(false);
  const [importingCsv, setImportingCsv] = useState(false);
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
        <Button variant="secondary" onClick={() => setImportingCsv(true)}>
          Import CSV…
        </Button>
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
        open={importingCsv}
        title={`Import CSV into ${station.name}`}
        onClose={() => setImportingCsv(false)}
      >
        <ImportCsvForm station={station} />
      </Dialog>
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
      arrays: graphArraysOf(graph.data),
    },
  );
  if (!graph.data) return <PageSpinner />;
  const { station } = graph.data;
  return (
    <>
      <PageHeader
        compact
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
