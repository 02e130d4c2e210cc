/**
 * Writes the invented demo station "Kestrel Station" to server/db/seed/kestrel-station.json.
 * Deterministic (no randomness): run `npx tsx scripts/generate-demo-station.ts` after changing it.
 *
 * Frame: +x starboard, +y forward (fore), +z zenith, metres, origin at the centre of the truss.
 * The truss runs along x: port bays PB4…PB1 (x < 0), centre bay CB, starboard bays SB1…SB4 (x > 0),
 * 3 m square in section. Each of the four long faces carries two handrail runs; the core module sits
 * forward of CB with the airlock at its fore end. Anchor spacing is mostly 4–4.5 m, with two long
 * stretches on purpose: the SB nadir outer run (about 28 m, longer than a 25.9 m tether) and the
 * PB fore upper run (about 21 m, too long for a 55 ft reel). A radiator keep-out box blocks both aft
 * runs across SB2/SB3, and an antenna caution sphere sits over the PB3 zenith runs.
 */
import fs from 'node:fs';
import { fileURLToPath } from 'node:url';
import {
  DEFAULT_SETTINGS,
  parseStationDocument,
  type Hazard,
  type Segment,
  type StationDocument,
  type StationEdge,
  type StationNode,
  type Vec3,
} from '../shared/schemas/station';

const HALF = 1.5;
const round = (v: number) => Math.round(v * 1000) / 1000;
const v3 = (x: number, y: number, z: number): Vec3 => [round(x), round(y), round(z)];

const BAYS: { key: string; label: string; x0: number; x1: number }[] = [
  ...[4, 3, 2, 1].map((i) => ({
    key: `PB${i}`,
    label: `Port bay ${i}`,
    x0: -3 - 7 * i,
    x1: -3 - 7 * (i - 1),
  })),
  { key: 'CB', label: 'Centre bay', x0: -3, x1: 3 },
  ...[1, 2, 3, 4].map((i) => ({
    key: `SB${i}`,
    label: `Starboard bay ${i}`,
    x0: 3 + 7 * (i - 1),
    x1: 3 + 7 * i,
  })),
];

/** Two runs per face, 0.75 m either side of the face centre line, with the face's outward normal. */
const FACES = [
  { face: 'zenith', normal: v3(0, 0, 1), at: (x: number, s: number) => v3(x, 0.75 * s, HALF) },
  { face: 'fore', normal: v3(0, 1, 0), at: (x: number, s: number) => v3(x, HALF, 0.75 * s) },
  { face: 'nadir', normal: v3(0, 0, -1), at: (x: number, s: number) => v3(x, 0.75 * s, -HALF) },
  { face: 'aft', normal: v3(0, -1, 0), at: (x: number, s: number) => v3(x, -HALF, 0.75 * s) },
] as const;
const SIDES = [1, -1] as const;
/** The run pairs that meet at each long edge of the truss (face + side, as in `runs`). */
const CORNERS = [
  ['zenith1', 'fore1'],
  ['fore-1', 'nadir1'],
  ['nadir-1', 'aft-1'],
  ['aft1', 'zenith-1'],
] as const;

function build(): StationDocument {
  const nodes: StationNode[] = [];
  const edges: StationEdge[] = [];
  const counters = new Map<string, number>();
  const byKey = new Map<string, StationNode>();

  const addNode = (
    prefix: string,
    kind: StationNode['kind'],
    position: Vec3,
    extra: Partial<StationNode> = {},
  ) => {
    const letter = { airlock: 'L', junction: 'J', anchor: 'A', socket: 'S', worksite: 'W' }[kind];
    const n = (counters.get(prefix + letter) ?? 0) + 1;
    counters.set(prefix + letter, n);
    const node: StationNode = {
      key: `${prefix}-${letter}${String(n).padStart(2, '0')}`,
      kind,
      position,
      ...extra,
    };
    nodes.push(node);
    byKey.set(node.key, node);
    return node.key;
  };
  const link = (from: string, to: string, kind: StationEdge['kind'], extra: Partial<StationEdge> = {}) =>
    edges.push({ from, to, kind, ...extra });
  const bayAt = (x: number) => BAYS.find((b) => x >= b.x0 - 1e-9 && x < b.x1 - 1e-9) ?? BAYS[BAYS.length - 1];

  // Stations along x where each run has a point: ~1.4–1.5 m apart, every bay boundary included.
  const xs: number[] = [];
  for (const b of BAYS) {
    const steps = Math.round((b.x1 - b.x0) / 1.45);
    for (let k = 0; k < steps; k++) xs.push(round(b.x0 + ((b.x1 - b.x0) * k) / steps));
  }
  xs.push(BAYS[BAYS.length - 1].x1);
  const boundaries = new Set([...BAYS.map((b) => b.x0), BAYS[BAYS.length - 1].x1]);

  const gap = (face: string, side: number, x: number) =>
    (face === 'nadir' && side === 1 && x > 3 && x < 31) ||
    (face === 'fore' && side === 1 && x > -24 && x < -8);

  /** runs[face][side][i] = key of the point at xs[i] */
  const runs = new Map<string, string[]>();
  for (const f of FACES) {
    for (const s of SIDES) {
      const keys: string[] = [];
      xs.forEach((x, i) => {
        const anchor = (i % 3 === 0 && !gap(f.face, s, x)) || i === xs.length - 1;
        keys.push(
          addNode(bayAt(x).key, anchor ? 'anchor' : 'junction', f.at(x, s), {
            label: `${f.face} run ${s > 0 ? 'A' : 'B'}, x ${x.toFixed(1)} m`,
          }),
        );
        if (i > 0) link(keys[i - 1], keys[i], 'handrail');
      });
      runs.set(`${f.face}${s}`, keys);
    }
  }
  // At every bay boundary: a cross rail between the two runs of a face, and a hop round each corner.
  xs.forEach((x, i) => {
    if (!boundaries.has(x)) return;
    for (const f of FACES) link(runs.get(`${f.face}1`)![i], runs.get(`${f.face}-1`)![i], 'handrail');
    for (const [a, b] of CORNERS) link(runs.get(a)![i], runs.get(b)![i], 'hop', { label: 'corner hop' });
  });

  // A foot-restraint socket at the middle of each bay face, normal pointing out of the face.
  for (const b of BAYS) {
    const mid = (b.x0 + b.x1) / 2;
    const i = xs.reduce((best, x, k) => (Math.abs(x - mid) < Math.abs(xs[best] - mid) ? k : best), 0);
    for (const f of FACES) {
      const key = addNode(b.key, 'socket', f.at(xs[i], 0), {
        normal: f.normal,
        label: `${b.label} ${f.face} foot restraint socket`,
      });
      link(runs.get(`${f.face}1`)![i], key, 'handrail');
    }
  }

  // Core module forward of CB, airlock at its fore end, two handrail runs along the zenith face.
  const coreRuns: string[][] = [];
  for (const s of SIDES) {
    const keys: string[] = [];
    for (let k = 0; k <= 6; k++) {
      const y = 1.8 + k * 1.45;
      keys.push(
        addNode('CORE', k % 3 === 0 ? 'anchor' : 'junction', v3(1.1 * s, y, 2.2), {
          label: `core zenith run ${s > 0 ? 'A' : 'B'}`,
        }),
      );
      if (k > 0) link(keys[k - 1], keys[k], 'handrail');
    }
    coreRuns.push(keys);
    link(keys[0], runs.get('zenith1')![xs.indexOf(1.5 * s)], 'hop', { label: 'core to truss' });
  }
  for (let k = 0; k <= 6; k += 3) link(coreRuns[0][k], coreRuns[1][k], 'handrail');
  const hatch = addNode('AL', 'airlock', v3(0, 13.7, 0.6), { label: 'Airlock outer hatch' });
  const alTop = addNode('AL', 'anchor', v3(0, 13.2, 1.6), { label: 'Airlock hatch handrail anchor' });
  const alAft = addNode('AL', 'junction', v3(0, 11.2, 1.6), { label: 'Airlock top handrail' });
  link(hatch, alTop, 'handrail');
  link(alTop, alAft, 'handrail');
  for (const run of coreRuns) link(alAft, run[run.length - 1], 'hop', { label: 'airlock to core' });
  addNode('AL', 'socket', v3(0.9, 13.7, 0), {
    normal: v3(0, 1, 0),
    label: 'Airlock hatch foot restraint socket',
  });
  link(hatch, 'AL-S01', 'handrail');

  // Worksites, each joined to the nearest run point and with a socket beside it. The task point is on
  // the unit being worked, 0.8 m proud of the face; the socket sits on the face 0.55 m to the side, so
  // with the default 1.0 m stand-off and 0.7 m reach the task is within reach (about 0.59 m).
  const TASK_PROUD_M = 0.8;
  const SOCKET_SIDE_M = 0.55;
  const worksite = (bay: string, label: string, surface: Vec3, normal: Vec3, socketSide: Vec3) => {
    const position = v3(
      surface[0] + normal[0] * TASK_PROUD_M,
      surface[1] + normal[1] * TASK_PROUD_M,
      surface[2] + normal[2] * TASK_PROUD_M,
    );
    const w = addNode(bay, 'worksite', position, { label });
    const nearest = nodes
      .filter((n) => n.kind === 'anchor' || n.kind === 'junction')
      .reduce((best, n) => (dist(n.position, position) < dist(best.position, position) ? n : best));
    link(nearest.key, w, 'handrail');
    // the side offset, kept in the face's plane and scaled to SOCKET_SIDE_M
    const along = socketSide[0] * normal[0] + socketSide[1] * normal[1] + socketSide[2] * normal[2];
    const side = [0, 1, 2].map((i) => socketSide[i] - along * normal[i]);
    const len = Math.hypot(side[0], side[1], side[2]) || 1;
    const socketAt = v3(
      surface[0] + (side[0] / len) * SOCKET_SIDE_M,
      surface[1] + (side[1] / len) * SOCKET_SIDE_M,
      surface[2] + (side[2] / len) * SOCKET_SIDE_M,
    );
    const s = addNode(bay, 'socket', socketAt, { normal, label: `${label} foot restraint socket` });
    link(nearest.key, s, 'handrail');
    return w;
  };
  worksite('SB3', 'Coolant pump module site', v3(20.5, 0, 1.8), v3(0, 0, 1), v3(-1.2, 0.4, -0.3));
  worksite('PB2', 'External camera boom mount', v3(-13.5, 1.8, 0), v3(0, 1, 0), v3(1.1, -0.3, 0.4));
  worksite('SB1', 'Power connector panel', v3(6.5, 0, -1.8), v3(0, 0, -1), v3(-1.0, -0.4, 0.3));
  worksite('PB3', 'Antenna feed connector', v3(-19, 0.4, 1.8), v3(0, 0, 1), v3(1.2, 0, -0.3));
  worksite('SB4', 'Radiator hinge inspection point', v3(22.5, -1.8, 0), v3(0, -1, 0), v3(1.0, 0.3, 0.5));
  worksite('CB', 'Stowage platform tool box', v3(0.8, 0, -3.1), v3(0, 0, -1), v3(-0.9, 0.3, 0.3));
  worksite('CORE', 'Window cover latch', v3(0, 7.6, 2.4), v3(0, 0, 1), v3(0, -1.0, -0.2));
  worksite('PB4', 'Port truss end light', v3(-31.2, 0, 1.8), v3(-1, 0, 0), v3(0.2, 0.8, -0.3));

  // The arm ride: from the core zenith to the starboard outer end.
  link(coreRuns[0][3], runs.get('zenith1')![xs.length - 1], 'ride', { label: 'Robotic arm ride' });

  // The robotic arm that positions a crew member: based on a pedestal over the SB1 zenith face, it
  // reaches the stowage platform, the pump site on SB3 and a survey point forward of the truss that
  // no handrail or socket reaches (made before the pedestal: the station's last node stays one a
  // handrail reaches).
  const survey = addNode('SB1', 'worksite', v3(8, 4, 8), { label: 'Forward mast survey point (arm only)' });
  const armBase = addNode('SB1', 'junction', v3(6, -0.75, 2.2), { label: 'Robotic arm base pedestal' });
  const onPedestal = nodes
    .filter((n) => n.kind === 'anchor' && n.position[2] === HALF)
    .reduce((best, n) =>
      dist(n.position, [6, -0.75, HALF]) < dist(best.position, [6, -0.75, HALF]) ? n : best,
    );
  link(onPedestal.key, armBase, 'handrail');
  // only the arm gets there (a ride, for the route finder when arm rides are allowed)
  link(armBase, survey, 'ride', { label: 'Arm ride to the survey point' });
  const arms: StationDocument['arms'] = [
    {
      key: 'ARM-1',
      label: 'Station robotic arm',
      baseNode: armBase,
      // the station's main arm is about 17.6 m long (fact of the trade); minimum reach, tip speed with
      // a person on it and settle time are planning defaults from memory
      reachM: 17.6,
      minReachM: 2,
      tipSpeedMps: 0.05,
      settleSeconds: 60,
    },
  ];

  const segments: Segment[] = [
    ...BAYS.map((b) => ({
      key: b.key,
      label: b.label,
      kind: 'truss' as const,
      center: v3((b.x0 + b.x1) / 2, 0, 0),
      size: v3(b.x1 - b.x0, 3, 3),
    })),
    { key: 'CORE', label: 'Core module', kind: 'module', center: v3(0, 6, 0), size: v3(4.4, 9, 4.4) },
    { key: 'AL', label: 'Airlock module', kind: 'module', center: v3(0, 12.1, 0), size: v3(3.2, 3.2, 3.2) },
    {
      key: 'ESP',
      label: 'Stowage platform',
      kind: 'platform',
      center: v3(0, 0, -2.6),
      size: v3(3, 2.4, 0.6),
    },
    { key: 'RAD', label: 'Starboard radiator', kind: 'platform', center: v3(17, -3, 0), size: v3(6, 3, 0.2) },
  ];
  const hazards: Hazard[] = [
    {
      key: 'RAD-1',
      kind: 'keep-out',
      label: 'Starboard radiator panel (keep out)',
      shape: 'box',
      min: v3(14, -4.6, -1.2),
      max: v3(19.5, -1.2, 1.2),
    },
    {
      key: 'ANT-1',
      kind: 'caution',
      label: 'Antenna radiation field (caution)',
      shape: 'sphere',
      center: v3(-19, 0, 3),
      radiusM: 2,
    },
  ];

  return {
    format: 'tetherwise.station',
    version: 1,
    name: 'Kestrel Station',
    orbit: { altitudeKm: 415, betaDeg: 24 },
    settings: structuredClone(DEFAULT_SETTINGS) as StationDocument['settings'],
    segments,
    nodes,
    edges,
    hazards,
    arms,
  };
}

function dist(a: Vec3, b: Vec3) {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

export function generateKestrelStation(): StationDocument {
  const doc = build();
  const checked = parseStationDocument(doc);
  if (!checked.ok)
    throw new Error(`generated station is not valid: ${JSON.stringify(checked.problems.slice(0, 5))}`);
  return doc;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const out = fileURLToPath(new URL('../server/db/seed/kestrel-station.json', import.meta.url));
  const doc = generateKestrelStation();
  fs.writeFileSync(out, JSON.stringify(doc, null, 1) + '\n');
  console.log(
    `wrote ${out}: ${doc.nodes.length} nodes, ${doc.edges.length} edges, ${doc.hazards.length} hazards, ${doc.segments.length} segments`,
  );
}
