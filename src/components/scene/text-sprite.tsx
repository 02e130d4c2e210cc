import { useEffect, useMemo, useRef } from 'react';
import { useThree } from '@react-three/fiber';
import * as THREE from 'three';
import { LABEL_PRIORITY } from './declutter';
import { usePlacedLabel } from './label-layer';

const FONT_PX = 26;
const PAD_PX = 8;

function labelTexture(text: string, background: string, color: string) {
  const canvas = document.createElement('canvas');
  const ctx = canvas.getContext('2d');
  const font = `600 ${FONT_PX}px Inter, ui-sans-serif, system-ui, sans-serif`;
  if (ctx) ctx.font = font;
  const width = Math.ceil((ctx?.measureText(text).width ?? text.length * FONT_PX * 0.6) + PAD_PX * 2);
  const height = FONT_PX + PAD_PX * 2;
  canvas.width = width;
  canvas.height = height;
  if (ctx) {
    ctx.fillStyle = background;
    ctx.beginPath();
    ctx.roundRect(0, 0, width, height, 6);
    ctx.fill();
    ctx.font = font;
    ctx.fillStyle = color;
    ctx.textBaseline = 'middle';
    ctx.fillText(text, PAD_PX, height / 2 + 1);
  }
  const texture = new THREE.CanvasTexture(canvas);
  texture.colorSpace = THREE.SRGBColorSpace;
  return { texture, width, height };
}

/**
 * A screen-sized text tag drawn in the scene itself (a sprite), so it needs no DOM node beside the
 * canvas and goes away with the scene; `shiftX` moves it right of its point by that share of its width.
 */
export function TextSprite({
  text,
  background,
  color,
  heightPx = 18,
  shiftX = -0.12,
  shiftY = 0.5,
  renderOrder = 16,
  priority = LABEL_PRIORITY.node,
  group,
}: {
  text: string;
  background: string;
  color: string;
  heightPx?: number;
  shiftX?: number;
  shiftY?: number;
  /** drawn after everything with a lower order (labels of a marker sit under the marker itself) */
  renderOrder?: number;
  /** which tags keep their place when tags would cover each other (`LABEL_PRIORITY`) */
  priority?: number;
  /** the marker this tag belongs to (it may sit against that marker's shape) */
  group?: unknown;
}) {
  const sprite = useRef<THREE.Sprite>(null);
  const label = useMemo(() => labelTexture(text, background, color), [text, background, color]);
  useEffect(() => () => label.texture.dispose(), [label]);
  const camera = useThree((s) => s.camera) as THREE.PerspectiveCamera;
  const viewHeight = useThree((s) => s.size.height);
  // with sizeAttenuation off a sprite's scale is in view units: convert the wanted pixel height
  const sy = (2 * heightPx * Math.tan(((camera.fov ?? 45) * Math.PI) / 360)) / Math.max(1, viewHeight);
  const sx = (sy * label.width) / label.height;
  usePlacedLabel(sprite, {
    priority,
    group,
    tag: { widthPx: (heightPx * label.width) / label.height, heightPx, shiftX, shiftY },
  });
  return (
    <sprite
      ref={sprite}
      scale={[sx, sy, 1]}
      center={new THREE.Vector2(shiftX, shiftY)}
      renderOrder={renderOrder}
      raycast={() => null}
    >
      <spriteMaterial map={label.texture} depthTest={false} sizeAttenuation={false} transparent />
    </sprite>
  );
}
