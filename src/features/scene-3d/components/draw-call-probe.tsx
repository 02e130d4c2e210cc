import { useFrame } from '@react-three/fiber';
import type * as THREE from 'three';

export interface LiveRenderStats {
  calls: number;
  triangles: number;
  frames: number;
}

declare global {
  interface Window {
    __twScene?: LiveRenderStats;
  }
}

function startCounting(info: THREE.WebGLInfo) {
  info.autoReset = false;
  info.reset();
}

function publish(el: HTMLElement | null, info: THREE.WebGLInfo) {
  if (!el) return;
  const frames = Number(el.dataset.frames ?? 0) + 1;
  el.dataset.drawCalls = String(info.render.calls);
  el.dataset.triangles = String(info.render.triangles);
  el.dataset.frames = String(frames);
  if (import.meta.env.DEV)
    window.__twScene = { calls: info.render.calls, triangles: info.render.triangles, frames };
}

/**
 * Reads the renderer's own counters for a whole frame (model, overlays and the axis gizmo). The
 * first callback runs before anything renders, the second after the gizmo's pass (priority 1).
 * The numbers go on the canvas wrapper as data attributes; dev builds also mirror them on window.
 */
export function DrawCallProbe({ target }: { target: { current: HTMLElement | null } }) {
  useFrame(({ gl }) => startCounting(gl.info), -1);
  useFrame(({ gl }) => publish(target.current, gl.info), 2);
  return null;
}
