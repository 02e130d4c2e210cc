import { useEffect, useImperativeHandle, useMemo, useRef, useState, type ReactNode, type Ref } from 'react';
import { GizmoHelper, GizmoViewport } from '@react-three/drei';
import { Canvas } from '@react-three/fiber';
import { LabelLayer } from '@/components/scene/label-layer';
import { cn } from '@/lib/cn';
import { STATION_UP } from '../builders/frame';
import type { SurfacePick } from '../builders/picking';
import { SCENE_COLORS } from '../builders/scene-colors';
import {
  DEFAULT_LAYERS,
  buildStationObjects,
  type SceneLayers,
  type SceneStation,
} from '../builders/station-objects';
import { ArmsLayer } from './arms-layer';
import { CameraRig } from './camera-rig';
import { DrawCallProbe } from './draw-call-probe';
import { HoverLabel, NodeLabels, SelectionHighlight, type SceneSelection } from './highlights';
import { StationModel } from './station-model';
import { SceneContext, type SceneApi } from './scene-api';

export interface StationSceneProps {
  graph: SceneStation;
  selection?: SceneSelection;
  onSelectNode?: (key: string) => void;
  onSelectHazard?: (key: string) => void;
  /** a click on a segment's surface: the world point and outward face normal (for snapping new nodes) */
  onPickSurface?: (pick: SurfacePick) => void;
  onHoverNode?: (key: string | null) => void;
  layers?: SceneLayers;
  /** extra r3f children drawn in the same canvas: route paths, swap markers, envelopes, pins */
  overlays?: ReactNode;
  /** arms an overlay draws itself (a playback moving them): left out of the arms layer */
  hiddenArms?: readonly string[];
  apiRef?: Ref<SceneApi>;
  label?: string;
  className?: string;
}

function Lights() {
  return (
    <>
      <ambientLight intensity={0.75} />
      <directionalLight position={[40, 25, 60]} intensity={1.8} />
      <directionalLight position={[-30, -40, -20]} intensity={0.4} />
    </>
  );
}

export function StationScene({
  graph,
  selection = null,
  onSelectNode,
  onSelectHazard,
  onPickSurface,
  onHoverNode,
  layers = DEFAULT_LAYERS,
  overlays,
  hiddenArms,
  apiRef,
  label = '3D view of the station',
  className,
}: StationSceneProps) {
  const wrapper = useRef<HTMLDivElement>(null);
  const innerApi = useRef<SceneApi>(null);
  const [hovered, setHovered] = useState<string | null>(null);
  const objects = useMemo(() => buildStationObjects(graph), [graph]);
  useEffect(() => () => objects.dispose(), [objects]);

  const api = useMemo<SceneApi>(
    () => ({
      fitToView: (points) => innerApi.current?.fitToView(points),
      setPresetView: (name) => innerApi.current?.setPresetView(name),
    }),
    [],
  );
  const context = useMemo(() => ({ api, layers }), [api, layers]);
  useImperativeHandle(apiRef, () => api, [api]);

  return (
    <div
      ref={wrapper}
      data-testid="station-scene"
      data-hovered={hovered ?? ''}
      data-selected={selection ? `${selection.type}:${selection.key}` : ''}
      role="region"
      aria-label={label}
      className={cn('relative overflow-hidden rounded-lg bg-ink-950', className)}
    >
      <Canvas
        frameloop="demand"
        dpr={[1, 1.5]}
        gl={{ antialias: true, preserveDrawingBuffer: true }}
        camera={{ fov: 45, up: STATION_UP, position: [30, 40, 25], near: 0.1, far: 5000 }}
        onCreated={({ gl }) => gl.setClearColor(SCENE_COLORS.background)}
      >
        <SceneContext.Provider value={context}>
          <LabelLayer report={wrapper}>
            <color attach="background" args={[SCENE_COLORS.background]} />
            <Lights />
            <StationModel
              objects={objects}
              layers={layers}
              statsTarget={wrapper}
              onHover={(key) => {
                setHovered(key);
                onHoverNode?.(key);
              }}
              onPick={(pick) => {
                if (pick.type === 'node') onSelectNode?.(pick.key);
                else if (pick.type === 'hazard') onSelectHazard?.(pick.key);
                else onPickSurface?.({ point: pick.point, normal: pick.normal, segmentKey: pick.segmentKey });
              }}
            />
            <SelectionHighlight station={graph} objects={objects} selection={selection} />
            {hovered && hovered !== (selection?.type === 'node' ? selection.key : null) && (
              <HoverLabel objects={objects} nodeKey={hovered} />
            )}
            {layers.labels && (
              <NodeLabels station={graph} hidden={selection?.type === 'node' ? selection.key : null} />
            )}
            <ArmsLayer station={graph} layers={layers} hidden={hiddenArms} />
            {overlays}
          </LabelLayer>
          <CameraRig outline={objects.outline} apiRef={innerApi} />
          <GizmoHelper alignment="bottom-left" margin={[64, 64]}>
            <GizmoViewport labels={['S', 'F', 'Z']} labelColor="#0a1220" axisHeadScale={0.9} />
          </GizmoHelper>
          <DrawCallProbe target={wrapper} />
        </SceneContext.Provider>
      </Canvas>
    </div>
  );
}
