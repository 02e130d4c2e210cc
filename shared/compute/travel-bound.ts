import { arcSecondsFor, type CompiledStation } from './compiled-station';
import { MinHeap } from './routes-heap';
import { excludeMaskFor } from './routes';
import type { StationSettings } from '../schemas/station';

/**
 * Least translation seconds between nodes, ignoring the tether: a lower bound on any route's
 * `totalSeconds` between them (a route is a walk over the same arcs, plus swaps; carrying only slows
 * it). One Dijkstra per source asked for, kept; Infinity when the target cannot be reached.
 */
export function travelLowerBound(
  c: CompiledStation,
  settings: StationSettings,
  allowRide: boolean,
): (from: string, to: string) => number {
  const { arcSeconds } = arcSecondsFor(c, settings);
  const mask = excludeMaskFor(allowRide);
  const slower = Math.min(1, settings.carryFactor);
  const bySource = new Map<number, Float64Array>();
  const heap = new MinHeap();
  const fromSource = (s: number) => {
    const dist = new Float64Array(c.nodeCount).fill(Infinity);
    dist[s] = 0;
    heap.clear();
    heap.push(s, 0);
    while (heap.size > 0) {
      const d = heap.topKey1();
      const v = heap.pop();
      if (d > dist[v]) continue;
      for (let a = c.offsets[v], end = c.offsets[v + 1]; a < end; a++) {
        if (c.arcFlags[a] & mask) continue;
        const u = c.targets[a];
        const nd = d + arcSeconds[a];
        if (nd < dist[u]) {
          dist[u] = nd;
          heap.push(u, nd);
        }
      }
    }
    return dist;
  };
  return (from, to) => {
    const s = c.keyToIndex.get(from);
    const t = c.keyToIndex.get(to);
    if (s === undefined || t === undefined) return 0;
    let dist = bySource.get(s);
    if (!dist) bySource.set(s, (dist = fromSource(s)));
    return dist[t] * slower;
  };
}
