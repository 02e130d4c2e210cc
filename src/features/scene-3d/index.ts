export { StationScene, type StationSceneProps } from './components/station-scene';
export { SceneToolbar, LAYER_LABELS } from './components/scene-toolbar';
export { SceneLegend } from './components/scene-legend';
export { PathLine, Marker, TranslucentSphere, SceneLabel, scenePieces } from './components/pieces';
export { useSceneApi, type SceneApi } from './components/scene-api';
export { edgeSelectionKey, type SceneSelection } from './components/highlights';
export {
  ALL_LAYERS_ON,
  DEFAULT_LAYERS,
  type LayerId,
  type SceneLayers,
  type SceneStation,
} from './builders/station-objects';
export { PRESET_VIEWS, type PresetView } from './builders/frame';
export type { SurfacePick } from './builders/picking';
