import { useEffect, useMemo, useRef } from 'react';
import { Line } from '@react-three/drei';
import { useFrame, useThree } from '@react-three/fiber';
import * as THREE from 'three';
import type { Line2, OrbitControls as OrbitControlsImpl } from 'three-stdlib';
import { armTipAtTime } from '@shared/compute/arm';
import type { ArmLane, EquipmentTrack } from '@shared/compute/day/types';
import { sampleTrack } from '@shared/compute/walkthrough';
import type { Vec3 } from '@shared/schemas/station';
import type { PlaybackClock } from '../lib/playback-clock';
import { trackPath, type Lane, type LaneId } from '../lib/playback-model';
import { ItemsLayer } from './items-layer';
import { LANE_STYLES } from './lane-styles';
import { ArmBoom } from '@/components/scene/arm-boom';
import { LABEL_PRIORITY } from '@/components/scene/declutter';
import { usePlacedLabel } from '@/components/scene/label-layer';
import { TextSprite } from '@/components/scene/text-sprite';

const noRaycast = () => null;
const FOLLOW_RADIUS_M = 3;

function extentOf(points: readonly Vec3[]): number {
  if (!points.length) return 10;
  const box = new THREE.Box3().setFromPoints(points.map((p) => new THREE.Vector3(...p)));
  return box.getSize(new THREE.Vector3()).length();
}

function MarkerShape({ lane, size, group }: { lane: LaneId; size: number; group: unknown }) {
  const style = LANE_STYLES[lane];
  const shape = useRef<THREE.Mesh>(null);
  usePlacedLabel(shape, { priority: LABEL_PRIORITY.crew, group, shape: { radiusM: size, minPx: 12 } });
  return (
    <mesh ref={shape} renderOrder={14} raycast={noRaycast}>
      {style.shape === 'octahedron' ? (
        <octahedronGeometry args={[size, 0]} />
      ) : (
        <boxGeometry args={[size * 1.4, size * 1.4, size * 1.4]} />
      )}
      <meshBasicMaterial color={style.color} depthTest={false} transparent />
    </mesh>
  );
}

/** One crew member: the marker moving along the track, the live tether to the current anchor, the anchor ring. */
function CrewMarker({
  lane,
  clock,
  positions,
  size,
}: {
  lane: Lane;
  clock: PlaybackClock;
  positions: Record<string, Vec3>;
  size: number;
}) {
  const group = useRef<THREE.Group>(null);
  const anchor = useRef<THREE.Mesh>(null);
  const tether = useRef<Line2>(null);
  const style = LANE_STYLES[lane.id];
  const marker = useMemo(() => ({}), []);
  const initial = useMemo(() => {
    const s = sampleTrack(lane.track, clock.t);
    return [positions[s.anchorKey] ?? s.position, s.position] as [Vec3, Vec3];
    // the first frame overwrites these; they only give the line its two points
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [lane.track, positions]);

  useFrame(() => {
    const s = sampleTrack(lane.track, clock.t);
    const a = positions[s.anchorKey] ?? s.position;
    group.current?.position.set(...s.position);
    anchor.current?.position.set(...a);
    tether.current?.geometry.setPositions([...a, ...s.position]);
  });

  return (
    <>
      <Line
        ref={tether}
        points={initial}
        color={style.tether}
        lineWidth={3}
        depthTest={false}
        renderOrder={13}
        raycast={noRaycast}
      />
      <mesh ref={anchor} renderOrder={13} raycast={noRaycast}>
        <torusGeometry args={[size * 0.9, size * 0.22, 8, 24]} />
        <meshBasicMaterial color={style.tether} depthTest={false} transparent />
      </mesh>
      <group ref={group}>
        <MarkerShape lane={lane.id} size={size} group={marker} />
        <TextSprite
          priority={LABEL_PRIORITY.crew}
          group={marker}
          text={`${style.glyph} ${lane.short}`}
          background={style.color}
          color="#0a1220"
          heightPx={20}
          // EV1's tag above its marker, EV2's below: side by side at a worksite they never cover each other
          shiftY={lane.id === 'EV2' ? 1.5 : -0.5}
        />
      </group>
    </>
  );
}

function LanePath({ lane, size, positions }: { lane: Lane; size: number; positions: Record<string, Vec3> }) {
  const style = LANE_STYLES[lane.id];
  const path = useMemo(() => trackPath(lane.track), [lane.track]);
  const swaps = useMemo(
    () =>
      lane.track.steps
        .filter((s) => s.type === 'swap' && s.clipKey)
        .map((s, i) => ({ id: s.id, key: s.clipKey!, n: i + 1 })),
    [lane.track],
  );
  return (
    <>
      {path.length >= 2 && (
        <Line
          points={path}
          color={style.color}
          lineWidth={2}
          dashed
          dashSize={size * 1.5}
          gapSize={size}
          transparent
          opacity={0.75}
          depthTest={false}
          renderOrder={10}
          raycast={noRaycast}
        />
      )}
      {swaps.map(
        (s) =>
          positions[s.key] && (
            <SwapPoint key={s.id} lane={lane} n={s.n} position={positions[s.key]} size={size} />
          ),
      )}
    </>
  );
}

function SwapPoint({ lane, n, position, size }: { lane: Lane; n: number; position: Vec3; size: number }) {
  const style = LANE_STYLES[lane.id];
  return (
    <group position={position}>
      <mesh renderOrder={11} raycast={noRaycast}>
        <sphereGeometry args={[size * 0.45, 12, 8]} />
        <meshBasicMaterial color={style.color} depthTest={false} transparent />
      </mesh>
      <TextSprite
        text={`${lane.short} swap ${n}`}
        priority={LABEL_PRIORITY.marker}
        background="#ffffff"
        color="#111826"
        heightPx={15}
        shiftX={0.5}
        shiftY={-0.6}
      />
    </group>
  );
}

/** Re-renders the on-demand canvas when the clock moves, and keeps a followed crew member in view. */
function ClockDriver({
  clock,
  lanes,
  onFrame,
}: {
  clock: PlaybackClock;
  lanes: readonly Lane[];
  onFrame?: (points: Vec3[]) => void;
}) {
  const invalidate = useThree((s) => s.invalidate);
  const camera = useThree((s) => s.camera);
  const controls = useThree((s) => s.controls) as OrbitControlsImpl | null;
  const delta = useMemo(() => new THREE.Vector3(), []);
  const followed = useRef<string>('free');
  useEffect(() => clock.subscribe(() => invalidate()), [clock, invalidate]);
  useFrame(() => {
    const lane = lanes.find((l) => l.id === clock.follow);
    if (followed.current !== clock.follow) {
      followed.current = clock.follow;
      // starting to follow: come in close enough to see the hooks and the tether
      if (lane) {
        const [x, y, z] = sampleTrack(lane.track, clock.t).position;
        const r = FOLLOW_RADIUS_M;
        onFrame?.([
          [x - r, y - r, z - r],
          [x + r, y + r, z + r],
        ]);
      }
      return;
    }
    if (!lane || !controls) return;
    const p = sampleTrack(lane.track, clock.t).position;
    delta.set(p[0], p[1], p[2]).sub(controls.target);
    if (delta.lengthSq() < 1e-10) return;
    controls.target.add(delta);
    camera.position.add(delta);
    controls.update();
  });
  return null;
}

/** Where each arm's tip is at a time (its start point before its first move). */
export function armTipsOf(arms: readonly ArmLane[]) {
  const byKey = new Map(arms.map((a) => [a.key, a]));
  return (key: string, t: number): Vec3 | null => {
    const lane = byKey.get(key);
    return lane ? armTipAtTime(lane, t) : null;
  };
}

/** The arms the day uses, each boom following its tip's moves on the clock. */
function MovingArms({ arms, clock, size }: { arms: readonly ArmLane[]; clock: PlaybackClock; size: number }) {
  return (
    <>
      {arms.map((arm) => (
        <ArmBoom
          key={arm.key}
          armKey={arm.key}
          base={arm.base}
          reachM={arm.reachM}
          size={size * 0.45}
          tip={() => armTipAtTime(arm, clock.t) ?? arm.base}
        />
      ))}
    </>
  );
}

/** Everything the walkthrough draws inside the station scene (pass as `StationScene`'s `overlays`). */
export function WalkthroughOverlays({
  clock,
  lanes,
  positions,
  equipment = [],
  normals = {},
  arms = [],
  onFrame,
}: {
  clock: PlaybackClock;
  lanes: readonly Lane[];
  positions: Record<string, Vec3>;
  /** a plan's items through the day, drawn where they are at the clock's time */
  equipment?: readonly EquipmentTrack[];
  /** sockets' outward normals, to stand an installed restraint on */
  normals?: Record<string, Vec3>;
  /** the arms the day uses: their booms move with their riders, and items on their ends with them */
  arms?: readonly ArmLane[];
  /** asks the scene to frame these points: every path at first, the followed crew member later */
  onFrame?: (points: Vec3[]) => void;
}) {
  const points = useMemo(() => lanes.flatMap((l) => trackPath(l.track)), [lanes]);
  const size = Math.min(1.2, Math.max(0.25, extentOf(points) / 90));
  const armTip = useMemo(() => armTipsOf(arms), [arms]);
  useEffect(() => {
    // after the camera rig's own first framing
    const id = setTimeout(() => onFrame?.(points), 50);
    return () => clearTimeout(id);
  }, [onFrame, points]);
  return (
    <>
      <ClockDriver clock={clock} lanes={lanes} onFrame={onFrame} />
      {lanes.map((lane) => (
        <LanePath key={`path-${lane.id}`} lane={lane} size={size} positions={positions} />
      ))}
      <MovingArms arms={arms} clock={clock} size={size} />
      <ItemsLayer
        equipment={equipment}
        armTip={armTip}
        clock={clock}
        lanes={lanes}
        positions={positions}
        normals={normals}
        size={size}
      />
      {lanes.map((lane) => (
        <CrewMarker key={lane.id} lane={lane} clock={clock} positions={positions} size={size} />
      ))}
    </>
  );
}
