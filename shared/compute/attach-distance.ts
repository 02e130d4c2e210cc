import type { CompiledStation } from './compiled-station';
import { scratchFor } from './routes-search';

/**
 * Metres from node `s` to the nearest attach point (the station's, or a node of `extraAttach`) over
 * arcs not in `excludeMask`; 0 when `s` is one, null when none can be reached. A Dijkstra on length
 * that stops at the first attach point it settles, so it costs a ball of that radius.
 */
export function nearestAttachM(
  c: CompiledStation,
  s: number,
  excludeMask: number,
  extraAttach: ReadonlySet<number>,
): number | null {
  const attach = (v: number) => c.isAttach[v] === 1 || extraAttach.has(v);
  if (attach(s)) return 0;
  const sc = scratchFor(c);
  const { seen, dist, heap } = sc;
  const stamp = sc.stamp;
  const { offsets, targets, arcFlags, arcLengthM } = c;
  heap.clear();
  seen[s] = stamp;
  dist[s] = 0;
  heap.push(s, 0);
  while (heap.size > 0) {
    const d = heap.topKey1();
    const v = heap.pop();
    if (d > dist[v]) continue;
    if (attach(v)) return d;
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      const nd = d + arcLengthM[a];
      if (seen[u] !== stamp || nd < dist[u]) {
        seen[u] = stamp;
        dist[u] = nd;
        heap.push(u, nd);
      }
    }
  }
  return null;
}
