import { StationScene } from '@/features/scene-3d';
import { useStationGraph } from '@/features/stations/api/get-station-graph';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import type { PlaybackSceneProps } from '@/features/walkthrough/components/walkthrough-player';

/** The station in 3D with a playback drawn in it (the walkthrough and the plan's day both use it). */
export function PlaybackScene({
  stationId,
  overlays,
  apiRef,
  label,
  className = 'h-[440px]',
  movingArms,
}: PlaybackSceneProps) {
  const graph = useStationGraph(stationId);
  if (graph.data)
    return (
      <StationScene
        graph={graph.data}
        apiRef={apiRef}
        label={label}
        className={className}
        overlays={overlays}
        hiddenArms={movingArms}
      />
    );
  return (
    <div className={cn('flex items-center justify-center rounded-lg bg-ink-950 text-ink-100', className)}>
      {graph.error ? (
        <p>
          The station model could not be loaded: {isApiError(graph.error) ? graph.error.message : 'error'}.
        </p>
      ) : (
        <Spinner label="Loading the station" />
      )}
    </div>
  );
}
