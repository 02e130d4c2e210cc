import { arcSecondsFor, type CompiledStation } from './compiled-station';
import { MinHeap } from './routes-heap';
import { excludeMaskFor } from './routes';
import type { StationSettings } from '../schemas/station';

/**
 * Least translation seconds between nodes, ignoring the tether: a lower bound on any route's
 * `totalSeconds` between them (a route is a walk over the same arcs, plus swaps; carrying only slows
 * it). Given a tether length (and no riding), the swaps too: a route pays out at most the tether's
 * length between two attach points and at least the shortest way's metres in all, so it swaps at
 * least ⌈metres / length⌉ − 1 times, each `swapSeconds`. One Dijkstra per source asked for, kept;
 * Infinity when the target cannot be reached.
 */
export function travelLowerBound(
  c: CompiledStation,
  settings: StationSettings,
  allowRide: boolean,
): (from: string, to: string, tetherLengthM?: number) => number {
  const { arcSeconds } = arcSecondsFor(c, settings);
  const mask = excludeMaskFor(allowRide);
  const slower = Math.min(1, settings.carryFactor);
  const bySource = new Map<number, Float64Array>();
  const metresBySource = new Map<number, Float64Array>();
  const heap = new MinHeap();
  const fromSource = (s: number, weights: Float64Array) => {
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
        const nd = d + weights[a];
        if (nd < dist[u]) {
          dist[u] = nd;
          heap.push(u, nd);
        }
      }
    }
    return dist;
  };
  const table = (cache: Map<number, Float64Array>, s: number, weights: Float64Array) => {
    let dist = cache.get(s);
    if (!dist) cache.set(s, (dist = fromSource(s, weights)));
    return dist;
  };
  return (from, to, tetherLengthM) => {
    const s = c.keyToIndex.get(from);
    const t = c.keyToIndex.get(to);
    if (s === undefined || t === undefined) return 0;
    const seconds = table(bySource, s, arcSeconds)[t] * slower;
    if (tetherLengthM === undefined || allowRide || !(tetherLengthM > 0) || s === t) return seconds;
    const metres = table(metresBySource, s, c.arcLengthM)[t];
    if (!Number.isFinite(metres)) return seconds;
    // the slack keeps a way of exactly k lengths at k − 1 swaps whatever the rounding
    const swaps = Math.max(0, Math.ceil(metres / tetherLengthM - 1e-9) - 1);
    return seconds + swaps * settings.swapSeconds;
  };
}
