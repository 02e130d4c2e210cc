// Scene objects for the demo station and generated 1k/10k-node trusses, built with the same
// builders the Station screen uses, and a naive one-object-per-thing scene as the reference.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import * as THREE from 'three';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { parseStationDocument } from '@shared/schemas/station';
import { countDrawCalls, type DrawStats } from '@/features/scene-3d/builders/draw-calls';
import { glyphGeometry } from '@/features/scene-3d/builders/glyphs';
import { buildStationObjects, type SceneStation } from '@/features/scene-3d/builders/station-objects';

const DRAW_CALL_TARGET = 40;
const here = path.dirname(fileURLToPath(import.meta.url));
const DEMO = path.join(here, '../server/db/seed/kestrel-station.json');

function naiveScene(station: SceneStation): THREE.Group {
  const root = new THREE.Group();
  const material = new THREE.MeshStandardMaterial();
  const lineMaterial = new THREE.LineBasicMaterial();
  const geometries = new Map<string, THREE.BufferGeometry>();
  const at = new Map(station.nodes.map((n) => [n.key, n.position]));
  for (const n of station.nodes) {
    let g = geometries.get(n.kind);
    if (!g) geometries.set(n.kind, (g = glyphGeometry(n.kind)));
    const mesh = new THREE.Mesh(g, material);
    mesh.position.set(...n.position);
    root.add(mesh);
  }
  for (const e of station.edges) {
    const a = at.get(e.from)!;
    const b = at.get(e.to)!;
    root.add(
      new THREE.Line(
        new THREE.BufferGeometry().setFromPoints([new THREE.Vector3(...a), new THREE.Vector3(...b)]),
        lineMaterial,
      ),
    );
  }
  const box = new THREE.BoxGeometry(1, 1, 1);
  for (const s of station.segments) {
    const mesh = new THREE.Mesh(box, material);
    mesh.position.set(...s.center);
    mesh.scale.set(...s.size);
    root.add(mesh);
  }
  for (let i = 0; i < station.hazards.length; i++) root.add(new THREE.Mesh(box, material));
  return root;
}

interface Row {
  name: string;
  nodes: number;
  edges: number;
  buildMs: number;
  scene: DrawStats;
  naive: DrawStats;
}

function measure(name: string, station: SceneStation): Row {
  buildStationObjects(station).dispose(); // warm-up, so the timing is not the first JIT pass
  const t0 = performance.now();
  const objects = buildStationObjects(station);
  const buildMs = performance.now() - t0;
  const scene = countDrawCalls(objects.root);
  objects.dispose();
  return {
    name,
    nodes: station.nodes.length,
    edges: station.edges.length,
    buildMs,
    scene,
    naive: countDrawCalls(naiveScene(station)),
  };
}

export async function run(): Promise<boolean> {
  const rows: Row[] = [];
  if (fs.existsSync(DEMO)) {
    const parsed = parseStationDocument(JSON.parse(fs.readFileSync(DEMO, 'utf8')));
    if (parsed.ok) rows.push(measure(parsed.doc.name, parsed.doc));
    else
      console.log(`demo station does not parse: ${parsed.problems[0]?.path} ${parsed.problems[0]?.message}`);
  } else {
    console.log(`demo station not found at ${path.relative(process.cwd(), DEMO)}; generated stations only`);
  }
  for (const n of [1000, 10000])
    rows.push(measure(`generated ${n}`, generateTrussStation({ nodes: n, seed: 7 })));

  let ok = true;
  console.log(
    'station                          nodes  edges  build ms  draw calls  triangles  line segs  naive calls  ratio  target',
  );
  for (const r of rows) {
    const pass = r.scene.drawCalls <= DRAW_CALL_TARGET;
    ok &&= pass;
    console.log(
      [
        r.name.slice(0, 32).padEnd(32),
        String(r.nodes).padStart(5),
        String(r.edges).padStart(6),
        r.buildMs.toFixed(1).padStart(9),
        String(r.scene.drawCalls).padStart(11),
        String(r.scene.triangles).padStart(10),
        String(r.scene.lineSegments).padStart(10),
        String(r.naive.drawCalls).padStart(12),
        `${(r.naive.drawCalls / r.scene.drawCalls).toFixed(0)}×`.padStart(6),
        `${pass ? 'PASS' : 'FAIL'} ≤ ${DRAW_CALL_TARGET}`.padStart(10),
      ].join(' '),
    );
  }
  return ok;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) await run();
