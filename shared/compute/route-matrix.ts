import type { RouteMatrix, RouteMatrixRequest, RouteRequest, RouteResult } from '../schemas/route';

/**
 * Work a matrix may ask for, in route searches × station nodes (a search costs about the station's
 * size): 10,000 cells on a 10k-node station, all 200 × 200 up to 2,500 nodes.
 */
export const MAX_MATRIX_WORK = 100_000_000;

/** The largest number of matrix nodes within MAX_MATRIX_WORK on a station of `stationNodes` nodes. */
export const matrixNodesFor = (stationNodes: number, most: number) =>
  Math.min(most, Math.floor(Math.sqrt(MAX_MATRIX_WORK / Math.max(1, stationNodes))));

/**
 * The route between every ordered pair of `request.nodes`, each cell by `route` on the same request
 * the routes endpoint gets without a start state, so each equals that single route: its
 * `totalSeconds` and `swapCount`, null where it is infeasible (a node to itself included: the single
 * route calls that `same-node`). A repeated pair is searched once.
 */
export function routeMatrix(
  request: RouteMatrixRequest,
  route: (request: RouteRequest) => RouteResult,
): RouteMatrix {
  const { nodes, ...common } = request;
  const asked = new Map<string, RouteResult>();
  const seconds: (number | null)[][] = [];
  const swaps: (number | null)[][] = [];
  for (const from of nodes) {
    const rowSeconds: (number | null)[] = [];
    const rowSwaps: (number | null)[] = [];
    for (const to of nodes) {
      const key = `${from}\u0000${to}`;
      let r = asked.get(key);
      if (!r) asked.set(key, (r = route({ ...common, from, to })));
      rowSeconds.push(r.feasible ? r.totalSeconds : null);
      rowSwaps.push(r.feasible ? r.swapCount : null);
    }
    seconds.push(rowSeconds);
    swaps.push(rowSwaps);
  }
  return { nodes: [...nodes], seconds, swaps };
}
