import { useEffect, useRef } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { countDrawCalls } from '../builders/draw-calls';
import { resolvePick, type ScenePick } from '../builders/picking';
import { applyLayers, type SceneLayers, type StationObjects } from '../builders/station-objects';

/** A press that moved more than this many pixels was an orbit or pan, not a click. */
const CLICK_SLOP_PX = 5;

function publishModelCalls(el: HTMLElement | null | undefined, objects: StationObjects) {
  if (el) el.dataset.modelDrawCalls = String(countDrawCalls(objects.root).drawCalls);
}

export function StationModel({
  objects,
  layers,
  onPick,
  onHover,
  statsTarget,
}: {
  objects: StationObjects;
  layers: SceneLayers;
  onPick: (pick: ScenePick) => void;
  onHover: (nodeKey: string | null) => void;
  /** gets the model's own draw-call count (no overlays, no gizmo) as `data-model-draw-calls` */
  statsTarget?: { current: HTMLElement | null };
}) {
  const invalidate = useThree((s) => s.invalidate);
  const hovered = useRef<string | null>(null);

  useEffect(() => {
    applyLayers(objects, layers);
    publishModelCalls(statsTarget?.current, objects);
    invalidate();
  }, [objects, layers, invalidate, statsTarget]);

  const hover = (key: string | null) => {
    if (hovered.current === key) return;
    hovered.current = key;
    document.body.style.cursor = key ? 'pointer' : '';
    onHover(key);
  };

  return (
    <primitive
      object={objects.root}
      onClick={(e: ThreeEvent<MouseEvent>) => {
        e.stopPropagation();
        if (e.delta > CLICK_SLOP_PX) return;
        const pick = resolvePick(e.intersections);
        if (pick) onPick(pick);
      }}
      onPointerMove={(e: ThreeEvent<PointerEvent>) => {
        e.stopPropagation();
        const pick = resolvePick(e.intersections);
        hover(pick?.type === 'node' ? pick.key : null);
      }}
      onPointerOut={() => hover(null)}
    />
  );
}
