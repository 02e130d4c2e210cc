import { useMemo } from 'react';
import type { StationNode } from '@shared/schemas/station';
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
    const keys = new Set((station.arms ?? []).map((a) => a.baseNode));
    const out = new Map<string, StationNode['position']>();
    for (const n of station.nodes) if (keys.has(n.key)) out.set(n.key, n.position);
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
