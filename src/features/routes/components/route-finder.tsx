import {
  useCallback,
  useEffect,
  useMemo,
  useRef,
  useState,
  useSyncExternalStore,
  type ReactNode,
} from 'react';
import type { RouteMode } from '@shared/schemas/route';
import type { NodeKind, Vec3 } from '@shared/schemas/station';
import type { LengthUnit } from '@shared/compute/units';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { Spinner } from '@/components/ui/spinner';
import { apiErrorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useRouteComparison, type RouteParams } from '../api/get-route';
import { tetherText, type RouteFormValues } from '../lib/route-form';
import { routeOverlayModel } from '../lib/route-overlay';
import { ModeComparisonTable } from './mode-comparison-table';
import { RouteFeasibleView, RouteInfeasibleView } from './route-result';
import { RouteFinderForm, type PickedNode, type PickField } from './route-finder-form';
import { RouteOverlay, type ScenePieces } from './route-overlay';

export interface RouteFinderStation {
  id: number;
  version: number;
  tetherLengthM: number;
  nodes: readonly { key: string; kind: NodeKind; label?: string; position: Vec3 }[];
}

interface Submitted {
  params: RouteParams;
  mode: RouteMode;
  unit: LengthUnit;
}

/** What the Station screen tells its panels: the selection, so "pick in 3D" sees node clicks. */
export interface RouteFinderPanelContext {
  selection: { type: string; key: string } | null;
}

export interface RouteFinder {
  /** a right-panel tab for the Station screen */
  tab: { id: string; label: string; render: (ctx?: RouteFinderPanelContext) => ReactNode };
  /** r3f children for the station scene */
  overlay: ReactNode;
  /** the same overlay as a component of stable identity, for screens that take one */
  Overlays: () => ReactNode;
  /** feed the scene's node clicks here first: true when a "pick in 3D" consumed the click */
  selectNode: (key: string) => boolean;
  picking: boolean;
}

/**
 * The route finder's state, shared by its panel and its 3D overlay, so the result survives a tab
 * switch. The three modes are three queries keyed by station id, version and parameters.
 */
export function useRouteFinder(
  station: RouteFinderStation | undefined,
  pieces: ScenePieces,
  options: { onFocusNode?: (key: string) => void } = {},
): RouteFinder {
  const [picking, setPicking] = useState<PickField | null>(null);
  const [picked, setPicked] = useState<PickedNode | null>(null);
  const [submitted, setSubmitted] = useState<Submitted | null>(null);
  const [formValues, setFormValues] = useState<RouteFormValues | null>(null);
  const [showReach, setShowReach] = useState(false);
  const comparison = useRouteComparison(
    station?.id ?? 0,
    station?.version ?? 0,
    station ? (submitted?.params ?? null) : null,
  );

  const nodes = station?.nodes;
  const positions = useMemo(() => new Map(nodes?.map((n) => [n.key, n.position]) ?? []), [nodes]);
  const options_ = useMemo(
    () =>
      [...(nodes ?? [])]
        .sort((a, b) => a.key.localeCompare(b.key))
        .map(({ key, label, kind }) => ({ key, label, kind })),
    [nodes],
  );

  const chosen = submitted ? comparison.byMode[submitted.mode] : undefined;
  const route = chosen?.data;
  const model = useMemo(
    () => (route?.feasible ? routeOverlayModel(route, (k) => positions.get(k)) : null),
    [route, positions],
  );

  const selectNode = useCallback(
    (key: string) => {
      if (!picking) return false;
      setPicked((p) => ({ field: picking, key, seq: (p?.seq ?? 0) + 1 }));
      setPicking(null);
      return true;
    },
    [picking],
  );

  const clearPicked = useCallback(() => setPicked(null), []);

  const defaults: RouteFormValues = formValues ?? {
    from: '',
    to: '',
    mode: 'balanced',
    tether: tetherText(station?.tetherLengthM ?? 25.9, 'm'),
    unit: 'm',
    carrying: false,
    allowRide: false,
  };

  const chooseMode = (mode: RouteMode) => {
    setSubmitted((s) => (s ? { ...s, mode } : s));
    setFormValues((v) => (v ? { ...v, mode } : v));
  };

  const render = (ctx?: RouteFinderPanelContext) => {
    if (!station) return <Spinner label="Loading the station" />;
    const unit = submitted?.unit ?? 'm';
    return (
      <div className="space-y-5">
        {ctx && <SelectionPick selection={ctx.selection} picking={picking !== null} onNode={selectNode} />}
        <RouteFinderForm
          options={options_}
          defaults={defaults}
          picking={picking}
          onTogglePick={(field) => setPicking((p) => (p === field ? null : field))}
          picked={picked}
          onPickApplied={clearPicked}
          mode={submitted?.mode}
          isFetching={comparison.isFetching}
          onModeChange={(mode) => submitted && chooseMode(mode)}
          onSubmit={(params, mode, u) => {
            setSubmitted({ params, mode, unit: u });
            setFormValues({
              ...defaults,
              from: params.from,
              to: params.to,
              mode,
              unit: u,
              tether: tetherText(params.tetherLengthM ?? station.tetherLengthM, u),
              carrying: params.carrying ?? false,
              allowRide: params.allowRide ?? false,
            });
          }}
        />
        {picking && (
          <p role="status" className="text-sm text-accent-strong">
            Click a node in the 3D view to fill {picking === 'from' ? 'From' : 'To'}.
          </p>
        )}
        {submitted && (
          <section aria-label="Route result" className="space-y-4 border-t border-surface-line pt-4">
            {chosen?.isPending && <Spinner label="Computing the route" />}
            {chosen?.error && (
              <Alert tone="danger">{apiErrorMessage(chosen.error, 'The route could not be computed.')}</Alert>
            )}
            {route?.feasible === false && <RouteInfeasibleView route={route} />}
            {route?.feasible && (
              <>
                <label className="flex items-center gap-2 text-sm text-text-strong">
                  <input
                    type="checkbox"
                    checked={showReach}
                    onChange={(e) => setShowReach(e.target.checked)}
                    className={cn('accent-accent', focusRing)}
                  />
                  Show tether reach in 3D (a sphere of the tether length at each clip point)
                </label>
                <RouteFeasibleView route={route} unit={unit} onFocusNode={options.onFocusNode} />
              </>
            )}
            <div className="space-y-2">
              <h3 className="text-sm font-semibold text-text-strong">Modes compared</h3>
              <ModeComparisonTable
                results={Object.fromEntries(Object.entries(comparison.byMode).map(([m, q]) => [m, q.data]))}
                chosen={submitted.mode}
                unit={unit}
                onChoose={chooseMode}
              />
            </div>
            <Button variant="secondary" size="sm" onClick={() => setSubmitted(null)}>
              Clear route
            </Button>
            <PlanningCaution />
          </section>
        )}
      </div>
    );
  };

  const overlay = useMemo(
    () => (model ? <RouteOverlay model={model} showReach={showReach} pieces={pieces} /> : null),
    [model, showReach, pieces],
  );
  const [store] = useState(createOverlayStore);
  useEffect(() => store.set(overlay), [store, overlay]);

  return {
    tab: { id: 'route', label: 'Route', render },
    overlay,
    Overlays: store.Component,
    selectNode,
    picking: picking !== null,
  };
}

/** While picking, a node newly selected on the screen (a click in 3D) fills the field. */
function SelectionPick({
  selection,
  picking,
  onNode,
}: {
  selection: RouteFinderPanelContext['selection'];
  picking: boolean;
  onNode: (key: string) => boolean;
}) {
  const key = selection?.type === 'node' ? selection.key : null;
  const seen = useRef(key);
  useEffect(() => {
    if (key === seen.current) return;
    seen.current = key;
    if (picking && key) onNode(key);
  }, [key, picking, onNode]);
  return null;
}

function createOverlayStore() {
  let node: ReactNode = null;
  const listeners = new Set<() => void>();
  const subscribe = (l: () => void) => {
    listeners.add(l);
    return () => listeners.delete(l);
  };
  const get = () => node;
  return {
    set(next: ReactNode) {
      node = next;
      for (const l of listeners) l();
    },
    Component: function RouteFinderOverlays() {
      return <>{useSyncExternalStore(subscribe, get)}</>;
    },
  };
}
