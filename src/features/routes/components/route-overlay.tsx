import type { ScenePieces } from '@/components/scene/scene-pieces';
import type { RouteOverlayModel } from '../lib/route-overlay';

// not used by any node, edge or hazard kind of the model, so the route stands out
export const ROUTE_COLORS = { path: '#a3e635', swap: '#fb923c', ends: '#ffffff', reach: '#a3e635' } as const;

export function RouteOverlay({
  model,
  showReach,
  pieces,
}: {
  model: RouteOverlayModel;
  showReach: boolean;
  pieces: ScenePieces;
}) {
  const { PathLine, Marker, TranslucentSphere } = pieces;
  return (
    <group name="route-overlay">
      <PathLine points={model.path} color={ROUTE_COLORS.path} width={5} />
      <Marker
        position={model.start.position}
        label={`Start ${model.start.key}`}
        color={ROUTE_COLORS.ends}
        size={0.35}
      />
      <Marker
        position={model.end.position}
        label={`End ${model.end.key}`}
        color={ROUTE_COLORS.ends}
        size={0.35}
      />
      {model.swaps.map((s) => (
        <Marker
          key={`${s.number}-${s.key}`}
          position={s.position}
          number={s.number}
          label={`Swap ${s.key}`}
          color={ROUTE_COLORS.swap}
          size={0.3}
        />
      ))}
      {showReach &&
        model.clips.map((c, i) => (
          <TranslucentSphere
            key={`${i}-${c.key}`}
            center={c.position}
            radius={model.tetherLengthM}
            color={ROUTE_COLORS.reach}
            opacity={0.07}
          />
        ))}
    </group>
  );
}
