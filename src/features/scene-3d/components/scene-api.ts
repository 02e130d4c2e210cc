import { createContext, useContext } from 'react';
import type { Vec3 } from '@shared/schemas/station';
import type { PresetView } from '../builders/frame';
import type { SceneLayers } from '../builders/station-objects';

export interface SceneApi {
  /** frames the given points, or the whole station, from the current viewing direction */
  fitToView(points?: readonly Vec3[]): void;
  setPresetView(name: PresetView | 'home'): void;
}

export interface SceneContextValue {
  api: SceneApi;
  layers: SceneLayers;
}

export const SceneContext = createContext<SceneContextValue | null>(null);

/** For overlays inside the canvas: the camera api and which layers are shown. */
export function useSceneApi(): SceneContextValue {
  const value = useContext(SceneContext);
  if (!value) throw new Error('useSceneApi is only available inside <StationScene>.');
  return value;
}
