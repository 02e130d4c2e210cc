import { useCallback, useMemo, useState } from 'react';
import type { RouteMode } from '@shared/schemas/route';
import { nodeIndexOf, type GraphArrays } from '@shared/compute/graph-columns';
import { NODE_KINDS, type Vec3 } from '@shared/schemas/station';
import type { LengthUnit } from '@shared/compute/units';
import { useRouteComparison, type RouteParams } from '../api/get-route';
import { tetherText, type PickedNode, type PickField, type RouteFormValues } from './route-form';
import { routeOverlayModel } from './route-overlay';

export interface RouteFinderStation {
  id: number;
  version: number;
  tetherLengthM: number;
  /** the station's nodes in columns (graphArraysOf) */
  arrays: GraphArrays;
}

type NodeOption = { key: string; label?: string; kind: (typeof NODE_KINDS)[number] };
const optionsOf = new WeakMap<GraphArrays, NodeOption[]>();

/** The station's nodes by key, as the form's choices; made once per graph. */
function nodeOptionsOf(arrays: GraphArrays): NodeOption[] {
  let made = optionsOf.get(arrays);
  if (made) return made;
  const { keys, labels, kinds } = arrays;
  const { compare } = new Intl.Collator();
  const order = keys.map((_, i) => i).sort((a, b) => compare(keys[a], keys[b]));
  made = order.map((i) => ({ key: keys[i], label: labels[i], kind: NODE_KINDS[kinds[i]] }));
  optionsOf.set(arrays, made);
  return made;
}

interface Submitted {
  params: RouteParams;
  mode: RouteMode;
  unit: LengthUnit;
}

/**
 * The route finder's state, held by the screen so its panel and its 3D overlay share it and the
 * result survives a tab switch. The three modes are three queries keyed by station id, version and
 * parameters.
 */
export function useRouteFinder(station: RouteFinderStation | undefined) {
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

  const arrays = station?.arrays;
  const positionOf = useCallback(
    (key: string): Vec3 | undefined => {
      const i = arrays && nodeIndexOf(arrays).get(key);
      if (!arrays || i === undefined) return undefined;
      const p = arrays.positions;
      return [p[i * 3], p[i * 3 + 1], p[i * 3 + 2]];
    },
    [arrays],
  );
  /** the nodes the form offers, by key: made when the form first asks (not while the screen opens) */
  const nodeOptions = useCallback(() => (arrays ? nodeOptionsOf(arrays) : []), [arrays]);

  const chosen = submitted ? comparison.byMode[submitted.mode] : undefined;
  const route = chosen?.data;
  /** what the 3D overlay draws: the chosen mode's route, when it is feasible */
  const model = useMemo(
    () => (route?.feasible ? routeOverlayModel(route, positionOf) : null),
    [route, positionOf],
  );

  /** a node clicked on the screen: fills the field being picked; true when it did */
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
  const togglePick = (field: PickField) => setPicking((p) => (p === field ? null : field));

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

  const submit = (params: RouteParams, mode: RouteMode, unit: LengthUnit) => {
    setSubmitted({ params, mode, unit });
    setFormValues({
      ...defaults,
      from: params.from,
      to: params.to,
      mode,
      unit,
      tether: tetherText(params.tetherLengthM ?? station?.tetherLengthM ?? 25.9, unit),
      carrying: params.carrying ?? false,
      allowRide: params.allowRide ?? false,
    });
  };

  return {
    station,
    nodeOptions,
    defaults,
    picking,
    togglePick,
    picked,
    clearPicked,
    selectNode,
    submitted,
    submit,
    clear: () => setSubmitted(null),
    chooseMode,
    comparison,
    chosen,
    route,
    model,
    showReach,
    setShowReach,
  };
}

export type RouteFinder = ReturnType<typeof useRouteFinder>;
