import fc from 'fast-check';
import * as THREE from 'three';
import { describe, expect, it } from 'vitest';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { nearestFacePoint } from '@shared/compute/truss-faces';
import {
  NODE_KINDS,
  parseStationDocument,
  type Segment,
  type StationDocument,
} from '@shared/schemas/station';
import { countDrawCalls } from '@/features/scene-3d/builders/draw-calls';
import { framing } from '@/features/scene-3d/builders/framing';
import { glyphGeometry } from '@/features/scene-3d/builders/glyphs';
import { resolvePick } from '@/features/scene-3d/builders/picking';
import {
  ALL_LAYERS_ON,
  applyLayers,
  buildStationObjects,
} from '@/features/scene-3d/builders/station-objects';
import { buildTrussGeometry, trussMemberCount } from '@/features/scene-3d/builders/truss';
import { buildStationDocument, FIXTURE_KEYS } from '../factories/station-document';

const fixture = (): StationDocument => {
  const parsed = parseStationDocument(buildStationDocument());
  if (!parsed.ok) throw new Error(parsed.problems[0].message);
  return parsed.doc;
};

const trianglesOf = (g: THREE.BufferGeometry) =>
  (g.index ? g.index.count : g.getAttribute('position').count) / 3;

describe('scene builders', () => {
  it('keeps draw calls flat from 1k to 10k nodes while the drawn triangles grow with the nodes', () => {
    const small = countDrawCalls(buildStationObjects(generateTrussStation({ nodes: 1000, seed: 3 })).root);
    const large = countDrawCalls(buildStationObjects(generateTrussStation({ nodes: 10000, seed: 3 })).root);
    expect(large.drawCalls).toBe(small.drawCalls);
    expect(large.drawCalls).toBeLessThanOrEqual(40);
    expect(large.triangles).toBeGreaterThan(5 * small.triangles);
  });

  it('draws one instance per node, in one instanced mesh per kind, with the instance → key map', () => {
    const doc = generateTrussStation({ nodes: 1500, seed: 11 });
    const objects = buildStationObjects(doc);
    let expectedTriangles = 0;
    for (const kind of NODE_KINDS) {
      const ofKind = doc.nodes.filter((n) => n.kind === kind);
      const mesh = objects.glyphs[kind] as THREE.InstancedMesh | undefined;
      expect(mesh?.count ?? 0).toBe(ofKind.length);
      if (!mesh) continue;
      expect(mesh.userData.pick.keys).toEqual(ofKind.map((n) => n.key));
      const m = new THREE.Matrix4();
      const p = new THREE.Vector3();
      mesh.getMatrixAt(ofKind.length - 1, m);
      p.setFromMatrixPosition(m);
      expect(p.toArray().map((v) => +v.toFixed(4))).toEqual(
        ofKind[ofKind.length - 1].position.map((v) => +v.toFixed(4)),
      );
      expectedTriangles += trianglesOf(glyphGeometry(kind)) * ofKind.length;
    }
    const glyphsOnly = new THREE.Group();
    for (const mesh of Object.values(objects.glyphs)) glyphsOnly.add(mesh!.clone());
    expect(countDrawCalls(glyphsOnly).triangles).toBe(expectedTriangles);
  });

  it('past the glyph budget draws the most numerous kinds as dots, one per node where the node is, picked by a ray passing near', () => {
    const doc = generateTrussStation({ nodes: 1500, seed: 11 });
    const objects = buildStationObjects(doc, { glyphBudget: 500 });
    objects.root.updateMatrixWorld(true);
    const ofKind = (kind: string) => doc.nodes.filter((n) => n.kind === kind);
    let instanced = 0;
    const dotted: string[] = [];
    for (const kind of NODE_KINDS) {
      const mesh = objects.glyphs[kind];
      if (mesh instanceof THREE.InstancedMesh) instanced += mesh.count;
      if (!(mesh instanceof THREE.Points)) continue;
      dotted.push(kind);
      const nodes = ofKind(kind);
      const at = mesh.geometry.getAttribute('position');
      expect(at.count).toBe(nodes.length);
      expect(mesh.userData.pick.keys).toEqual(nodes.map((n) => n.key));
      const last = nodes.length - 1;
      expect([at.getX(last), at.getY(last), at.getZ(last)].map((v) => +v.toFixed(3))).toEqual(
        nodes[last].position.map((v) => +v.toFixed(3)),
      );
    }
    // the largest kind goes first, and only as many as needed
    expect(dotted[0] ?? '').toBe('junction');
    expect(instanced).toBeLessThanOrEqual(500);
    expect(instanced + ofKind('junction').length).toBeGreaterThan(500);
    expect(countDrawCalls(objects.root).points).toBe(doc.nodes.length - instanced);

    // the highest junction, seen from 30 m above and 2 cm to the side
    const top = ofKind('junction').reduce((a, b) => (b.position[2] > a.position[2] ? b : a));
    const [x, y, z] = top.position;
    const down = (dx: number) =>
      resolvePick(
        new THREE.Raycaster(
          new THREE.Vector3(x + dx, y, z + 30),
          new THREE.Vector3(0, 0, -1),
        ).intersectObject(objects.glyphs.junction!),
      );
    expect(down(0.02)).toEqual({ type: 'node', key: top.key });
    // 1 m to the side at 30 m is well outside a dot's reach
    expect(down(1)?.type === 'node' && (down(1) as { key: string }).key === top.key).toBe(false);
    applyLayers(objects, { ...ALL_LAYERS_ON, junction: false });
    expect(down(0.02)).toBeNull();
  });

  it('builds each truss bay from four longerons, a frame per bay station and a brace per bay face', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 2, max: 60, noNaN: true }),
        fc.double({ min: 1, max: 5, noNaN: true }),
        (length, width) => {
          const segment: Segment = {
            key: 'T',
            kind: 'truss',
            center: [0, 0, 0],
            size: [length, width, width],
          };
          const { bays, members } = trussMemberCount(segment);
          expect(bays).toBe(Math.max(1, Math.round(length / width)));
          expect(members).toBe(4 + 4 * (bays + 1) + 4 * bays);
          const positions = buildTrussGeometry([segment]).getAttribute('position');
          expect(positions.count).toBe(2 * members);
          // every member end lies on the segment's box
          for (let i = 0; i < positions.count; i++) {
            expect(Math.abs(positions.getX(i))).toBeLessThanOrEqual(length / 2 + 1e-4);
            const y = Math.abs(positions.getY(i));
            const z = Math.abs(positions.getZ(i));
            expect(Math.abs(y - width / 2) < 1e-4 && Math.abs(z - width / 2) < 1e-4).toBe(true);
          }
        },
      ),
      { numRuns: 50 },
    );
  });

  it('turns a rotated truss segment the way truss-faces.ts reads it', () => {
    const segment: Segment = {
      key: 'R',
      kind: 'truss',
      center: [3, -2, 1],
      size: [10, 2, 2],
      rotationDeg: [0, 0, 90],
    };
    const positions = buildTrussGeometry([segment]).getAttribute('position');
    for (let i = 0; i < positions.count; i++) {
      const p: [number, number, number] = [positions.getX(i), positions.getY(i), positions.getZ(i)];
      expect(nearestFacePoint([segment], p)!.distanceM).toBeLessThan(1e-4);
    }
  });

  it('hides parts by layer and stops counting their draw calls', () => {
    const objects = buildStationObjects(fixture());
    const all = countDrawCalls(objects.root).drawCalls;
    applyLayers(objects, { ...ALL_LAYERS_ON, anchor: false, hazards: false });
    const hazardMeshes = objects.hazards.length;
    expect(countDrawCalls(objects.root).drawCalls).toBe(all - 1 - hazardMeshes);
    applyLayers(objects, ALL_LAYERS_ON);
    expect(countDrawCalls(objects.root).drawCalls).toBe(all);
  });
});

describe('scene picking', () => {
  const objects = buildStationObjects(fixture());
  objects.root.updateMatrixWorld(true);
  const cast = (from: THREE.Vector3, to: THREE.Vector3) => {
    const ray = new THREE.Raycaster(from, to.clone().sub(from).normalize());
    return resolvePick(ray.intersectObject(objects.root, true));
  };

  it('picks a node glyph through the translucent truss box round it', () => {
    const anchor = fixture().nodes.find((n) => n.key === FIXTURE_KEYS.anchorNear)!;
    const target = new THREE.Vector3(...anchor.position);
    expect(cast(target.clone().add(new THREE.Vector3(0, 0, 20)), target)).toEqual({
      type: 'node',
      key: anchor.key,
    });
  });

  it('reports a segment surface hit with the world point and the outward face normal', () => {
    // the test truss bay T1 is centred at (5, 0, 0), 10 × 3 × 3: its −y face is at y = −1.5
    const pick = cast(new THREE.Vector3(6.2, -10, 0.3), new THREE.Vector3(6.2, 0, 0.3));
    expect(pick?.type).toBe('segment');
    if (pick?.type !== 'segment') return;
    expect(pick.segmentKey).toBe(FIXTURE_KEYS.segment);
    expect(pick.point.map((v) => +v.toFixed(4))).toEqual([6.2, -1.5, 0.3]);
    expect(pick.normal.map((v) => +v.toFixed(4) + 0)).toEqual([0, -1, 0]);
  });

  it('skips a hidden glyph layer and picks what is behind it', () => {
    const anchor = fixture().nodes.find((n) => n.key === FIXTURE_KEYS.anchorNear)!;
    const target = new THREE.Vector3(...anchor.position);
    applyLayers(objects, { ...ALL_LAYERS_ON, anchor: false });
    const pick = cast(target.clone().add(new THREE.Vector3(0, 0, 20)), target);
    applyLayers(objects, ALL_LAYERS_ON);
    expect(pick?.type).toBe('segment');
  });
});

describe('camera framing', () => {
  const coord = fc.double({ min: -200, max: 200, noNaN: true });
  const size = fc.double({ min: 0.1, max: 300, noNaN: true });
  const unit = fc.double({ min: -1, max: 1, noNaN: true });

  it('puts every corner of the box inside the view frustum, from any direction', () => {
    fc.assert(
      fc.property(
        coord,
        coord,
        coord,
        size,
        size,
        size,
        unit,
        unit,
        unit,
        fc.double({ min: 0.5, max: 2.5, noNaN: true }),
        (x, y, z, sx, sy, sz, dx, dy, dz, aspect) => {
          fc.pre(Math.hypot(dx, dy, dz) > 0.1);
          const box = new THREE.Box3(new THREE.Vector3(x, y, z), new THREE.Vector3(x + sx, y + sy, z + sz));
          const f = framing(box, new THREE.Vector3(dx, dy, dz), 45, aspect);
          const camera = new THREE.PerspectiveCamera(
            45,
            aspect,
            f.distance / 1000,
            f.distance + f.radius * 20,
          );
          camera.up.set(0, 0, 1);
          camera.position.copy(f.position);
          camera.lookAt(f.target);
          camera.updateMatrixWorld();
          const p = new THREE.Vector3();
          for (let i = 0; i < 8; i++) {
            p.set(
              i & 1 ? box.max.x : box.min.x,
              i & 2 ? box.max.y : box.min.y,
              i & 4 ? box.max.z : box.min.z,
            ).project(camera);
            expect(Math.abs(p.x)).toBeLessThanOrEqual(1 + 1e-6);
            expect(Math.abs(p.y)).toBeLessThanOrEqual(1 + 1e-6);
          }
        },
      ),
      { numRuns: 200 },
    );
  });
});
