import type { RouteFeasible, RouteInfeasible } from '@shared/schemas/route';
import type { Vec3 } from '@shared/schemas/station';

export interface OverlayPoint {
  key: string;
  position: Vec3;
}

export interface RouteOverlayModel {
  path: Vec3[];
  start: OverlayPoint;
  end: OverlayPoint;
  swaps: (OverlayPoint & { number: number })[];
  /** where the tether is clipped in turn: the start, then every swap */
  clips: OverlayPoint[];
  tetherLengthM: number;
}

/** What the 3D overlay draws for a route; null when a node of the route is not in the loaded graph. */
export function routeOverlayModel(
  route: RouteFeasible,
  positionOf: (key: string) => Vec3 | undefined,
): RouteOverlayModel | null {
  const path: Vec3[] = [];
  for (const key of route.nodes) {
    const p = positionOf(key);
    if (!p) return null;
    path.push(p);
  }
  const point = (key: string): OverlayPoint => ({ key, position: positionOf(key)! });
  const swaps = route.swaps.map((s, i) => ({ ...point(s.node), number: i + 1 }));
  const start = point(route.nodes[0]);
  return {
    path,
    start,
    end: point(route.nodes[route.nodes.length - 1]),
    swaps,
    clips: [start, ...swaps.map(({ key, position }) => ({ key, position }))],
    tetherLengthM: route.tetherLengthM,
  };
}

const REASON_TITLES: Record<RouteInfeasible['reasonCode'], string> = {
  'same-node': 'From and To are the same node',
  disconnected: 'No way between these two points',
  'blocked-by-hazard': 'Blocked by a keep-out volume',
  'anchor-gap': 'An anchor gap is longer than the tether',
  'start-not-attachable': 'The tether cannot be clipped at the start',
};

export const reasonTitle = (route: RouteInfeasible) => REASON_TITLES[route.reasonCode] ?? 'No route';
