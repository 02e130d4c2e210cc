import type { ScenePieces } from '@/components/scene/scene-pieces';
import type { SocketPlanner } from '../lib/use-socket-planner';
import { PickedPointsOverlay, SocketPlanOverlay } from './socket-overlay';

/** The points picked on the model and, once planned, the sockets with their envelopes. */
export function SocketPlannerOverlay({ planner, pieces }: { planner: SocketPlanner; pieces: ScenePieces }) {
  const { picked, run, views } = planner;
  return (
    <>
      {picked.length > 0 && <PickedPointsOverlay points={picked} pieces={pieces} />}
      {run && views.length > 0 && <SocketPlanOverlay sockets={views} targets={run.targets} pieces={pieces} />}
    </>
  );
}
