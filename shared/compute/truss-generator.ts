import type { Hazard, Segment, StationDocument, StationEdge, StationNode, Vec3 } from '../schemas/station';
import { StationSettingsSchema } from '../schemas/station';

/**
 * A synthetic long-truss station for benchmarks and tests: box bays along x, handrail runs along
 * the four long faces with a junction every 1.25 m, anchors every 3.75 m, cross rails once per bay,
 * hops round the corners every other bay, short dead-end anchor stubs, worksites with sockets, an
 * airlock at x < 0, one arm ride, a keep-out sphere and a caution box. Some runs have stretches with
 * no anchors, and near the far end one zone has none on any run except dead-end stubs, so the tether
 * search has real work there. Deterministic for a seed.
 */

export interface TrussOptions {
  nodes: number;
  seed: number;
}

const BAY_M = 5;
const STEP_M = 1.25;
const STEPS_PER_BAY = 4;
const ANCHOR_EVERY = 3;

/** mulberry32: small, fast, good enough for layout noise and benchmark queries */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function generateTrussStation({ nodes: wanted, seed }: TrussOptions): StationDocument {
  const rand = seededRandom(seed);
  const runs = Math.min(8, Math.max(2, Math.round(Math.sqrt(wanted) / 16)));
  const perSlice = 4 * runs;
  const bays = Math.max(2, Math.ceil(wanted / (perSlice * STEPS_PER_BAY)));
  const slices = bays * STEPS_PER_BAY;
  const width = Math.max(3, runs * 1.0);
  const h = width / 2;
  const spacing = width / runs;

  // (face, run) → (y, z) round the perimeter, so run R-1 of a face sits next to run 0 of the next
  const around = (face: number, run: number): [number, number] => {
    const c = -h + (run + 0.5) * spacing;
    switch (face) {
      case 0:
        return [h, c];
      case 1:
        return [-c, h];
      case 2:
        return [-h, -c];
      default:
        return [c, -h];
    }
  };
  const outward = (face: number): Vec3 =>
    [
      [0, 1, 0],
      [0, 0, 1],
      [0, -1, 0],
      [0, 0, -1],
    ][face] as Vec3;

  const sparseFrom = Math.floor(slices * 0.9);
  const sparseTo = sparseFrom + 6 * STEPS_PER_BAY;
  const bare = new Uint8Array(4 * runs * slices);
  for (let fr = 0; fr < 4 * runs; fr++) {
    for (let i = 0; i < slices; i++) {
      if (rand() < 0.004) {
        const len = (2 + Math.floor(rand() * 2)) * STEPS_PER_BAY;
        for (let j = i; j < Math.min(slices, i + len); j++) bare[fr * slices + j] = 1;
      }
    }
  }

  const nodes: StationNode[] = [];
  const edges: StationEdge[] = [];
  const keyAt = (face: number, run: number, i: number) => `S${i}-${face}.${run}`;
  const add = (n: StationNode) => nodes.push(n);
  const link = (from: string, to: string, kind: StationEdge['kind'] = 'handrail') =>
    edges.push({ from, to, kind });

  add({ key: 'AL', kind: 'airlock', label: 'Airlock', position: [-2, 0, 0] });
  for (let i = 0; i < slices; i++) {
    const x = i * STEP_M + STEP_M / 2;
    const bay = Math.floor(i / STEPS_PER_BAY);
    const sparse = i >= sparseFrom && i < sparseTo;
    for (let face = 0; face < 4; face++) {
      for (let run = 0; run < runs; run++) {
        const [y, z] = around(face, run);
        const key = keyAt(face, run, i);
        const anchor = i % ANCHOR_EVERY === 1 && !sparse && !bare[(face * runs + run) * slices + i];
        add({ key, kind: anchor ? 'anchor' : 'junction', position: [x, y, z] });
        if (i > 0) link(keyAt(face, run, i - 1), key);
        if (i === 0) link('AL', key, 'hop');
        if (run > 0 && i % STEPS_PER_BAY === 0) link(keyAt(face, run - 1, i), key);
        const n = outward(face);
        const stubHere = sparse ? i === sparseFrom + 12 && run === 0 : rand() < 0.03;
        if (stubHere) {
          const stub = `${key}-T`;
          add({ key: stub, kind: 'anchor', position: [x, y + n[1] * 0.5, z + n[2] * 0.5] });
          link(key, stub);
        }
      }
      if (i % (2 * STEPS_PER_BAY) === 2) link(keyAt(face, runs - 1, i), keyAt((face + 1) % 4, 0, i), 'hop');
    }
    if (i % (10 * STEPS_PER_BAY) === 2 && bay > 0) {
      const face = bay % 4;
      const [y, z] = around(face, 0);
      const n = outward(face);
      const ws = `W${bay}`;
      add({ key: ws, kind: 'worksite', position: [x, y + n[1] * 0.4, z + n[2] * 0.4] });
      link(keyAt(face, 0, i), ws);
      for (const dx of [-0.6, 0.6]) {
        const sk = `${ws}-F${dx < 0 ? 1 : 2}`;
        add({ key: sk, kind: 'socket', position: [x + dx, y + n[1] * 0.1, z + n[2] * 0.1], normal: n });
        link(ws, sk);
      }
    }
  }

  if (nodes.length > wanted) {
    const keep = new Set(nodes.slice(0, wanted).map((n) => n.key));
    nodes.length = wanted;
    const kept = edges.filter((e) => keep.has(e.from) && keep.has(e.to));
    edges.length = 0;
    edges.push(...kept);
  }

  const rideTo = keyAt(1, 0, Math.min(slices - 1, 3 * ANCHOR_EVERY + 1));
  if (nodes.some((n) => n.key === rideTo))
    edges.push({ from: 'AL', to: rideTo, kind: 'ride', label: 'Arm ride' });

  const length = slices * STEP_M;
  const hazards: Hazard[] = [
    {
      key: 'KO-1',
      kind: 'keep-out',
      label: 'Radiator keep-out',
      shape: 'sphere',
      center: [length * 0.6, 0, h],
      radiusM: 1.2,
    },
    {
      key: 'CA-1',
      kind: 'caution',
      label: 'Antenna caution',
      shape: 'box',
      min: [length * 0.3, -h - 0.5, -h],
      max: [length * 0.3 + BAY_M, -h + 0.3, h],
    },
  ];
  const segments: Segment[] = [];
  for (let b = 0; b < bays; b++) {
    segments.push({
      key: `B${b}`,
      kind: 'truss',
      center: [b * BAY_M + BAY_M / 2, 0, 0],
      size: [BAY_M, width, width],
    });
  }
  return {
    format: 'tetherwise.station',
    version: 1,
    name: `Generated truss (${nodes.length} nodes, seed ${seed})`,
    orbit: { altitudeKm: 410, betaDeg: 20 },
    settings: StationSettingsSchema.parse({}),
    segments,
    nodes,
    edges,
    hazards,
    arms: [],
  };
}
