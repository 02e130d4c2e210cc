import { createContext, useContext, useEffect, useMemo, type ReactNode, type RefObject } from 'react';
import { useFrame, type RootState } from '@react-three/fiber';
import * as THREE from 'three';
import { declutter, type LabelCandidate } from './declutter';

/** Something drawn in screen pixels that the label layer places: a tag, or a marker's own shape. */
interface Placed {
  object: THREE.Object3D;
  priority: number;
  group?: unknown;
  /** a tag: its size in pixels and where its point sits in it (a sprite's `center`) */
  tag?: { widthPx: number; heightPx: number; shiftX: number; shiftY: number };
  /** a marker's shape: its radius in metres (times its world scale) and the least it draws in pixels */
  shape?: { radiusM: number; minPx: number };
}

const LabelRegistry = createContext<Set<Placed> | null>(null);

function shownInScene(object: THREE.Object3D): boolean {
  for (let o = object.parent; o; o = o.parent) if (!o.visible) return false;
  return true;
}

const at = new THREE.Vector3();
const scale = new THREE.Vector3();

/** Projects every tag and marker shape, shows the tags that fit and reports them on `el`. */
function placeLabels(placed: ReadonlySet<Placed>, state: RootState, el: HTMLElement | null | undefined) {
  const { camera, size } = state;
  const fov = ((camera as THREE.PerspectiveCamera).fov ?? 45) * (Math.PI / 180);
  const entries: Placed[] = [];
  const candidates: LabelCandidate[] = [];
  for (const p of placed) {
    if (!shownInScene(p.object)) {
      if (p.tag) p.object.visible = false;
      continue;
    }
    p.object.getWorldPosition(at);
    const depth = at.distanceTo(camera.position);
    at.project(camera);
    if (at.z > 1 || at.z < -1) {
      if (p.tag) p.object.visible = false;
      continue;
    }
    const x = ((at.x + 1) / 2) * size.width;
    const y = ((1 - at.y) / 2) * size.height;
    let rect;
    if (p.tag) {
      const { widthPx: w, heightPx: h, shiftX, shiftY } = p.tag;
      rect = { left: x - shiftX * w, top: y - (1 - shiftY) * h, width: w, height: h };
    } else {
      const perPx = (2 * depth * Math.tan(fov / 2)) / Math.max(1, size.height);
      p.object.getWorldScale(scale);
      const d = Math.max(p.shape!.minPx, (2 * p.shape!.radiusM * scale.x) / perPx);
      rect = { left: x - d / 2, top: y - d / 2, width: d, height: d };
    }
    entries.push(p);
    candidates.push({ rect, priority: p.priority, depth, obstacle: !p.tag, group: p.group });
  }
  const shown = declutter(candidates);
  entries.forEach((p, i) => {
    if (p.tag) p.object.visible = shown[i];
  });
  if (el) {
    const tags = candidates.filter((c, i) => shown[i] && !c.obstacle);
    el.dataset.labels = `${tags.length}/${candidates.filter((c) => !c.obstacle).length}`;
    el.dataset.labelRects = JSON.stringify(
      tags.map((c) => [c.rect.left, c.rect.top, c.rect.width, c.rect.height].map(Math.round)),
    );
  }
}

/**
 * Keeps the scene's tags from covering one another (or a marker): before each frame it projects
 * every tag, and draws those that fit, most important and then nearest first. `report` gets the
 * drawn tags' boxes as `data-label-rects` and the counts as `data-labels` ("drawn/all").
 */
export function LabelLayer({
  children,
  report,
}: {
  children: ReactNode;
  report?: RefObject<HTMLElement | null>;
}) {
  const placed = useMemo(() => new Set<Placed>(), []);
  useFrame((state) => {
    placeLabels(placed, state, report?.current);
    // a frame callback with a priority renders the frame itself, unless another one does (the gizmo)
    if (state.internal.priority === 1) state.gl.render(state.scene, state.camera);
  }, 0.5);
  return <LabelRegistry.Provider value={placed}>{children}</LabelRegistry.Provider>;
}

/** Puts a tag or a marker's shape under the label layer of the scene (no layer: drawn as is). */
export function usePlacedLabel(ref: RefObject<THREE.Object3D | null>, entry: Omit<Placed, 'object'>) {
  const registry = useContext(LabelRegistry);
  const { priority, group, tag, shape } = entry;
  const w = tag?.widthPx;
  const h = tag?.heightPx;
  const sx = tag?.shiftX;
  const sy = tag?.shiftY;
  const r = shape?.radiusM;
  const min = shape?.minPx;
  useEffect(() => {
    const object = ref.current;
    if (!registry || !object) return;
    const p: Placed = {
      object,
      priority,
      group,
      tag: w !== undefined ? { widthPx: w, heightPx: h!, shiftX: sx!, shiftY: sy! } : undefined,
      shape: r !== undefined ? { radiusM: r, minPx: min! } : undefined,
    };
    registry.add(p);
    return () => {
      registry.delete(p);
      object.visible = true;
    };
  }, [registry, ref, priority, group, w, h, sx, sy, r, min]);
}
