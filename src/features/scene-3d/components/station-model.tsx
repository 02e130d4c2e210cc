import { useEffect, useRef } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { resolvePick, type ScenePick } from '../builders/picking';
import { applyLayers, type SceneLayers, type StationObjects } from '../builders/station-objects';

/** A press that moved more than this many pixels was an orbit or pan, not a click. */
const CLICK_SLOP_PX = 5;

export function StationModel({
  objects,
  layers,
  onPick,
  onHover,
}: {
  objects: StationObjects;
  layers: SceneLayers;
  onPick: (pick: ScenePick) => void;
  onHover: (nodeKey: string | null) => void;
}) {
  const invalidate = useThree((s) => s.invalidate);
  const hovered = useRef<string | null>(null);

  useEffect(() => {
    applyLayers(objects, layers);
    invalidate();
  }, [objects, layers, invalidate]);

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
