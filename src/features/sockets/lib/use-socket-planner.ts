import { useMemo, useState } from 'react';
import { useMutation, type QueryKey } from '@tanstack/react-query';
import type { AcceptSocketPlanResult, SocketPlanRequest } from '@shared/schemas/sockets';
import type { NodeKind, Vec3 } from '@shared/schemas/station';
import type { LengthUnit } from '@shared/compute/units';
import { staleVersionOf } from '@/lib/api-client';
import { previewSocketPlanAccept, useAcceptSocketPlan } from '../api/accept-socket-plan';
import { useSocketPlan } from '../api/get-socket-plan';
import { assignmentRows, newSocketsToAccept, plannedSocketViews, type PlanTarget } from './planned-sockets';

export interface SocketPlannerStation {
  id: number;
  version: number;
  reach: { standOffM: number; radiusM: number };
  nodes: readonly { key: string; kind: NodeKind; label?: string; position: Vec3; normal?: Vec3 }[];
}

/** One planning run: what was asked, of which station version, with the targets as listed. */
export interface SocketPlanRun {
  request: SocketPlanRequest;
  version: number;
  targets: PlanTarget[];
  unit: LengthUnit;
}

/**
 * The socket planner's state, held by the screen so the controls, the result and the 3D overlay
 * share it: the points picked on the model, the run shown and its accept.
 */
export function useSocketPlanner(
  station: SocketPlannerStation,
  options: {
    /** the caller's queries an accept makes stale (the station graph) */
    invalidates: readonly QueryKey[];
  },
) {
  const nodesByKey = useMemo(() => new Map(station.nodes.map((n) => [n.key, n])), [station.nodes]);
  const [picked, setPicked] = useState<PlanTarget[]>([]);
  const [picking, setPicking] = useState(false);
  const [pickCount, setPickCount] = useState(0);
  const [run, setRun] = useState<SocketPlanRun | null>(null);
  const [accepted, setAccepted] = useState<AcceptSocketPlanResult | null>(null);
  /** null frames the whole plan; an index frames that socket's envelope and its targets */
  const [framed, setFramed] = useState<number | null>(null);

  const plan = useSocketPlan(station.id, run?.version ?? station.version, run?.request ?? null);
  const accept = useAcceptSocketPlan({ invalidates: options.invalidates, onSuccess: setAccepted });
  // the accept is asked first: a dry run lists what it adds and the reviewed plans it touches
  const preview = useMutation({ mutationFn: previewSocketPlanAccept });
  const views = useMemo(
    () => (plan.data && run ? plannedSocketViews(plan.data, nodesByKey, station.reach) : []),
    [plan.data, run, nodesByKey, station.reach],
  );
  const rows = plan.data && run ? assignmentRows(plan.data, run.targets, views) : [];

  /** points to frame in 3D once a plan is shown: the envelopes and their targets */
  const focus = useMemo(() => {
    if (!run || views.length === 0) return null;
    const shown = framed === null ? views : views.filter((v) => v.index === framed);
    const box = shown.flatMap((v) =>
      [-1, 1].flatMap((d) =>
        [0, 1, 2].map((axis) => v.workPoint.map((c, i) => (i === axis ? c + d * v.radiusM * 2 : c)) as Vec3),
      ),
    );
    return [...box, ...shown.flatMap((v) => v.targets.map((t) => run.targets[t].position))];
  }, [run, views, framed]);

  return {
    station,
    nodesByKey,
    picked,
    picking,
    togglePicking: () => setPicking((p) => !p),
    removePicked: (index: number) => setPicked((ps) => ps.filter((_, j) => j !== index)),
    /** feed the scene's surface picks here: true when picking targets consumed it */
    pickSurface: ({ point }: { point: Vec3 }) => {
      if (!picking) return false;
      setPicked((ps) => [...ps, { label: `Point ${pickCount + 1}`, position: point }]);
      setPickCount((n) => n + 1);
      return true;
    },
    run,
    /** plans `request` against the station version on screen */
    start: (next: Omit<SocketPlanRun, 'version'>) => {
      setAccepted(null);
      setFramed(null);
      accept.reset();
      preview.reset();
      setRun({ ...next, version: station.version });
    },
    /** drops the run, e.g. after the station changed under it */
    discard: () => {
      setRun(null);
      accept.reset();
      preview.reset();
    },
    plan,
    views,
    rows,
    newCount: views.filter((v) => v.isNew).length,
    framed,
    setFramed,
    focus,
    accept,
    preview,
    /** asks the server what accepting the new sockets would add (nothing is written) */
    previewNew: () => {
      accept.reset();
      if (run)
        preview.mutate({
          stationId: station.id,
          version: run.version,
          sockets: newSocketsToAccept(views, run.targets),
        });
    },
    /** writes what the preview showed */
    acceptNew: () => {
      const asked = preview.variables;
      preview.reset();
      if (asked) accept.mutate(asked);
    },
    cancelAccept: () => preview.reset(),
    accepted,
    /** the accept was refused because the station changed since the run */
    conflict: staleVersionOf(accept.error ?? preview.error) !== null,
  };
}

export type SocketPlanner = ReturnType<typeof useSocketPlanner>;
