import * as THREE from 'three';

export interface DrawStats {
  drawCalls: number;
  triangles: number;
  lineSegments: number;
  instances: number;
  /** dots (one vertex each) */
  points: number;
}

/**
 * What a WebGL renderer would issue for the visible objects under `root`: one call per drawn
 * object and material group (an instanced mesh is one call for all its instances), triangles
 * counted per instance × instance count.
 */
export function countDrawCalls(root: THREE.Object3D): DrawStats {
  const stats: DrawStats = { drawCalls: 0, triangles: 0, lineSegments: 0, instances: 0, points: 0 };
  root.traverseVisible((o) => {
    if (!(o instanceof THREE.Mesh || o instanceof THREE.Line || o instanceof THREE.Points)) return;
    const drawn: THREE.Mesh | THREE.Line | THREE.Points = o;
    const geometry = drawn.geometry as THREE.BufferGeometry;
    const instances = drawn instanceof THREE.InstancedMesh ? drawn.count : 1;
    if (instances === 0) return;
    const groups = Array.isArray(drawn.material) ? Math.max(1, geometry.groups.length) : 1;
    stats.drawCalls += groups;
    stats.instances += instances;
    const vertices = geometry.index ? geometry.index.count : (geometry.getAttribute('position')?.count ?? 0);
    if (drawn instanceof THREE.Mesh) stats.triangles += (vertices / 3) * instances;
    else if (drawn instanceof THREE.LineSegments) stats.lineSegments += vertices / 2;
    else if (drawn instanceof THREE.Line) stats.lineSegments += Math.max(0, vertices - 1);
    else stats.points += vertices;
  });
  return stats;
}
