import { useMemo } from 'react';
import { graphArraysOf } from '@shared/compute/graph-columns';
import type { Vec3 } from '@shared/schemas/station';
import { ArmBoom, ArmShell } from '@/components/scene/arm-boom';
import { boomRestTip } from '@/components/scene/boom-pose';
import type { SceneLayers, SceneStation } from '../builders/station-objects';

/**
 * The station's robotic arms at rest, each a boom on its base node, and (a layer of its own) the
 * shell its tip can reach. Arms a playback moves are drawn by the playback instead (`hidden`).
 */
export function ArmsLayer({
  station,
  layers,
  hidden = [],
}: {
  station: SceneStation;
  layers: SceneLayers;
  hidden?: readonly string[];
}) {
  const bases = useMemo(() => {
    const out = new Map<string, Vec3>();
    if (!station.arms?.length) return out;
    const { keys, positions: p } = graphArraysOf(station);
    const bases = new Set(station.arms.map((a) => a.baseNode));
    keys.forEach((key, i) => {
      if (bases.has(key)) out.set(key, [p[i * 3], p[i * 3 + 1], p[i * 3 + 2]]);
    });
    return out;
  }, [station]);
  return (
    <>
      {(station.arms ?? []).map((arm) => {
        const base = bases.get(arm.baseNode);
        if (!base) return null;
        return (
          <group key={arm.key}>
            {layers.arms && !hidden.includes(arm.key) && (
              <ArmBoom armKey={arm.key} base={base} reachM={arm.reachM} tip={boomRestTip(base, arm.reachM)} />
            )}
            {layers.armReach && <ArmShell base={base} reachM={arm.reachM} minReachM={arm.minReachM} />}
          </group>
        );
      })}
    </>
  );
}
