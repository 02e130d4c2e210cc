import type { PlanDetail } from '@shared/schemas/plan-views';
import { describeTouch } from '@shared/compute/plan-touches';
import { Alert } from '@/components/ui/alert';

/**
 * An approved plan whose station moved on since its approval: it is still computed on the version it
 * was approved on, and says which changes since touch its tasks, routes and sockets.
 */
export function StationChangeBanner({ plan }: { plan: PlanDetail }) {
  if (!plan.stationChangedSinceApproval) return null;
  return (
    <Alert tone="caution" title="The station changed since this plan was approved">
      <p>
        Approved on station version {plan.stationVersion}; the station is now at version{' '}
        {plan.currentStationVersion}. The day below is still computed on version {plan.stationVersion}.
      </p>
      {plan.stationChanges.length ? (
        <ul className="mt-2 list-disc pl-5" aria-label="Changes that touch this plan">
          {plan.stationChanges.map((c) => (
            <li key={`${c.what}:${c.id}`}>{describeTouch(c)}</li>
          ))}
        </ul>
      ) : (
        <p className="mt-1">None of the changes touches its tasks, routes or sockets.</p>
      )}
    </Alert>
  );
}
