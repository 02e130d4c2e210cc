import createGraph from 'ngraph.graph';
import { nba } from 'ngraph.path';
import type { RouteMode } from '@shared/schemas/route';
import { compileStation, type CompiledStation } from '@shared/compute/compiled-station';
import { CLIP_BUILD_FREE_NODES, excludeMaskFor, findRoute } from '@shared/compute/routes';
import { clipGraphFor } from '@shared/compute/routes-clip';
import { MinHeap } from '@shared/compute/routes-heap';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';

/**
 * The engine as it runs once a station's clip graph is built. The server's default `auto` strategy
 * uses the label search on stations above CLIP_BUILD_FREE_NODES until then (building one at 100k
 * takes most of a minute, printed below as the clip-graph build), so on those sizes the label
 * search is timed too for the exact modes, once per query, and printed without a target of its
 * own (`fastest` runs the same A* with tether labels either way; only its fallback differs). On
 * those sizes the same queries are also timed from a tether state as the day asks them (half the
 * tether already out from the start's anchor, one extra attach point, and at most half the tether
 * out on arrival), on the clip graph, against its answer from a fresh clip.
 */
const CLIP = { strategy: 'clip-graph' } as const;
const LABELS = { strategy: 'label-search' } as const;

/**
 * Route engine benchmark on generated trusses: compile cost and size, the clip graph for the
 * default tether, then per-query times of each mode against a plain typed-array Dijkstra on the
 * same compiled graph and queries (the reference), and ngraph.path's NBA* as an outside point of
 * comparison.
 *
 * Targets: `fastest` median within 1.5× the reference's; the exact modes' median within 5× (10k)
 * and 10× (100k), and at 10k for them a spread criterion (at 100k the spread is printed only). Random attach-to-attach queries range from
 * neighbours to the whole truss, so raw times (the reference's too) have p95 far above their
 * median. What the engine controls is its cost relative to the plain search on the same query, so
 * the spread criterion is on the per-query ratio (mode time ÷ reference time): its p95 must be
 * within P95_SPREAD× its median. Raw p95/median and the per-query ratios are printed for every row,
 * `fastest`'s too.
 */

const SIZES = [
  { nodes: 1_000, queries: 200, targets: null },
  { nodes: 10_000, queries: 150, targets: { fastest: 1.5, exact: 5, spread: true } },
  { nodes: 100_000, queries: 100, targets: { fastest: 1.5, exact: 10, spread: false } },
] as const;
/**
 * The p95 of 40 queries is their third worst, and one slow spell of the machine moved it by a
 * quarter between runs; 100 on the largest truss keep it steadier. The outside points of
 * comparison (ngraph.path, and the label search where it is printed) take most of the time per
 * query and have no target, so on every size they run on the first OUTSIDE_QUERIES only.
 */
const OUTSIDE_QUERIES = 40;
const MODES: RouteMode[] = ['fastest', 'fewest-swaps', 'balanced'];
const P95_SPREAD = 3;

function referenceDijkstra(
  c: CompiledStation,
  dist: Float64Array,
  heap: MinHeap,
  s: number,
  t: number,
): number {
  dist.fill(Infinity);
  heap.clear();
  dist[s] = 0;
  heap.push(s, 0);
  const { offsets, targets, arcSeconds } = c;
  while (heap.size > 0) {
    const d = heap.topKey1();
    const v = heap.pop();
    if (d > dist[v]) continue;
    if (v === t) return d;
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      const u = targets[a];
      const nd = d + arcSeconds[a];
      if (nd < dist[u]) {
        dist[u] = nd;
        heap.push(u, nd);
      }
    }
  }
  return Infinity;
}

function quantile(sorted: number[], q: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[i];
}

function summary(times: number[]) {
  const s = [...times].sort((a, b) => a - b);
  return { median: quantile(s, 0.5), p95: quantile(s, 0.95) };
}

const ms = (v: number) => v.toFixed(3);

/**
 * Each query is timed as the fastest of REPEATS runs, the reference and every mode alike: on a
 * shared machine a single run often includes the process being descheduled, which is not the
 * engine's cost. The runs of one query are a whole pass over the queries apart, so a slow spell of
 * the machine (they last longer than a few runs of one query) cannot fall on all of them.
 */
const REPEATS = 5;

function timed(fn: () => void): number {
  const a = performance.now();
  fn();
  return performance.now() - a;
}

export async function run(): Promise<boolean> {
  let allPass = true;
  console.log('\n== routes: translation route engine ==');
  const started = performance.now();
  for (const size of SIZES) {
    const doc = generateTrussStation({ nodes: size.nodes, seed: 7 });
    const t0 = performance.now();
    const c = compileStation(doc);
    const compileMs = performance.now() - t0;
    const settings = doc.settings;
    const t1 = performance.now();
    const clip = clipGraphFor(c, c.arcSeconds, settings.tetherLengthM, excludeMaskFor(false));
    const clipMs = performance.now() - t1;

    const rand = seededRandom(size.nodes);
    const attach: number[] = [];
    for (let v = 0; v < c.nodeCount; v++) if (c.isAttach[v]) attach.push(v);
    const queries: [number, number][] = [];
    while (queries.length < size.queries) {
      const s = attach[Math.floor(rand() * attach.length)];
      const t = attach[Math.floor(rand() * attach.length)];
      if (s !== t) queries.push([s, t]);
    }
    // one extra attach point per query, on any node (the tether-state rows)
    const extraAttach = queries.map(() => c.keys[Math.floor(rand() * c.nodeCount)]);

    const ng = createGraph<unknown, { w: number }>();
    for (let e = 0; e < c.edgeCount; e++) {
      const a = c.edgeFrom[e];
      const b = c.edgeTo[e];
      const arc = c.offsets[a] + [...c.arcEdge.subarray(c.offsets[a], c.offsets[a + 1])].indexOf(e);
      ng.addLink(a, b, { w: c.arcSeconds[arc] });
    }
    const ngFinder = nba(ng, { distance: (_f, _t, link) => link.data.w });

    const dist = new Float64Array(c.nodeCount);
    const heap = new MinHeap(1024);
    const times: Record<string, number[]> = { reference: [], 'ngraph nba': [] };
    const ratios: Record<string, number[]> = {};
    for (const m of MODES) {
      times[m] = [];
      ratios[m] = [];
    }
    let fallbacks = 0;
    let infeasible = 0;
    const warm = Math.min(10, queries.length);
    for (let i = 0; i < warm; i++) {
      const [s, t] = queries[i];
      referenceDijkstra(c, dist, heap, s, t);
      for (const mode of MODES) findRoute(c, settings, { from: c.keys[s], to: c.keys[t], mode }, CLIP);
    }
    const best = (list: number[], i: number, took: number) => {
      if (!(list[i] <= took)) list[i] = took;
    };
    for (let round = 0; round < REPEATS; round++) {
      for (let i = 0; i < queries.length; i++) {
        const [s, t] = queries[i];
        best(
          times.reference,
          i,
          timed(() => referenceDijkstra(c, dist, heap, s, t)),
        );
        if (round === 0 && i < OUTSIDE_QUERIES) times['ngraph nba'].push(timed(() => ngFinder.find(s, t)));
        for (const mode of MODES) {
          const request = { from: c.keys[s], to: c.keys[t], mode };
          let r: ReturnType<typeof findRoute> | undefined;
          best(
            times[mode],
            i,
            timed(() => (r = findRoute(c, settings, request, CLIP))),
          );
          if (!r) continue;
          if (round > 0) continue;
          if (!r.feasible) infeasible++;
          else if (mode === 'fastest' && r.warnings.some((w) => w.startsWith('The quickest way needs')))
            fallbacks++;
          if (c.nodeCount > CLIP_BUILD_FREE_NODES && mode !== 'fastest' && i < OUTSIDE_QUERIES) {
            const name = `${mode} (label search)`;
            (times[name] ??= []).push(timed(() => findRoute(c, settings, request, LABELS)));
            const held = {
              ...request,
              startAnchor: request.from,
              startPaidOutM: settings.tetherLengthM / 2,
              extraAttach: [extraAttach[i]],
              endPaidOutMaxM: settings.tetherLengthM / 2,
            };
            const heldName = `${mode} (tether state)`;
            (times[heldName] ??= []).push(timed(() => findRoute(c, settings, held, CLIP)));
            const heldLabels = `${mode} (tether state, label search)`;
            (times[heldLabels] ??= []).push(timed(() => findRoute(c, settings, held, LABELS)));
          }
        }
      }
    }
    for (const name of Object.keys(times)) {
      if (name === 'reference' || name === 'ngraph nba') continue;
      ratios[name] = times[name].map((took, i) => took / times.reference[i]);
    }

    const refMedian = summary(times.reference).median;
    const freeSwaps = clip.pruned.get(0);
    const costMarks = clip.costMarks.get(settings.swapSeconds);
    console.log(
      `\n${c.nodeCount} nodes, ${c.edgeCount} edges, ${attach.length} attach points, ${queries.length} attach-to-attach queries` +
        (queries.length > OUTSIDE_QUERIES
          ? ` (ngraph.path and the label search on the first ${OUTSIDE_QUERIES})`
          : ''),
    );
    console.log(
      `compile ${compileMs.toFixed(1)} ms; index ${(c.memoryBytes / 1e6).toFixed(2)} MB (${(c.memoryBytes / c.nodeCount).toFixed(0)} B/node); ` +
        `clip graph (${settings.tetherLengthM} m tether) ${clipMs.toFixed(1)} ms, ${(clip.memoryBytes / 1e6).toFixed(2)} MB, ` +
        `${clip.targets.length} stretches (${(clip.targets.length / Math.max(1, clip.attachNodes.length)).toFixed(1)} per attach point), ` +
        `${clip.swapRows.targets.length} worth a swap (${clip.swapRows.buildMs.toFixed(0)} ms of the build)` +
        (freeSwaps
          ? `, ${freeSwaps.targets.length} kept for free swaps (${freeSwaps.buildMs.toFixed(0)} ms, on first use)`
          : '') +
        (costMarks
          ? `, ${costMarks.count} cost landmarks for balanced (${costMarks.buildMs.toFixed(0)} ms, on first use)`
          : '') +
        '; ' +
        `fastest needed the tether search on ${fallbacks} queries; ${infeasible} infeasible answers`,
    );
    const rows = Object.entries(times).map(([name, list]) => {
      const { median, p95 } = summary(list);
      // the outside points ran on the first queries only: compare them with the same ones
      const ref =
        list.length === queries.length ? refMedian : summary(times.reference.slice(0, list.length)).median;
      const row: Record<string, string> = {
        'median ms': ms(median),
        'p95 ms': ms(p95),
        'p95/median': (p95 / median).toFixed(2),
        'median / reference': (median / ref).toFixed(2),
      };
      if (ratios[name]) {
        const r = summary(ratios[name]);
        row['per-query ratio median'] = r.median.toFixed(2);
        row['per-query ratio p95'] = r.p95.toFixed(2);
      }
      if (size.targets && (MODES as string[]).includes(name)) {
        const fastest = name === 'fastest';
        const spread = !fastest && size.targets.spread;
        const limit = fastest ? size.targets.fastest : size.targets.exact;
        const r = summary(ratios[name]);
        const okRatio = median / refMedian <= limit;
        const okSpread = !spread || r.p95 <= P95_SPREAD * r.median;
        row.target = spread ? `≤${limit}×, ratio p95 ≤${P95_SPREAD}× ratio median` : `≤${limit}×`;
        row.result = okRatio && okSpread ? 'PASS' : 'FAIL';
        if (!okRatio || !okSpread) allPass = false;
      }
      return [name, row] as const;
    });
    console.table(Object.fromEntries(rows));
    const startRatios = MODES.filter((m) => times[`${m} (tether state)`]).map((m) => {
      const held = times[`${m} (tether state)`];
      const r = summary(held.map((took, i) => took / times[m][i]));
      return `${m} median ${r.median.toFixed(1)}×, p95 ${r.p95.toFixed(1)}×`;
    });
    if (startRatios.length)
      console.log(
        `from a tether state (with an extra attach point and a limit on arrival) against a fresh clip, both on the clip graph, per query on the same ${OUTSIDE_QUERIES}: ${startRatios.join('; ')}`,
      );
  }
  console.log(`routes bench took ${((performance.now() - started) / 1000).toFixed(1)} s`);
  return allPass;
}
