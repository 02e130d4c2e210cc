import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { staleVersionOf } from '@/lib/api-client';
import { useStationAudit } from '../api/get-station-audit';

interface ConflictNoticeProps {
  error: unknown;
  stationId: number;
  /** what the refused change was, e.g. "add node PB3-A08" */
  what: string;
  onReload: () => void;
  /** sends the same change again against the version named */
  onReapply?: (version: number) => void;
}

/** A refused edit: a stale version (409) says who changed the station; anything else shows the server's message. */
export function ConflictNotice({ error, stationId, what, onReload, onReapply }: ConflictNoticeProps) {
  const stale = staleVersionOf(error);
  const audit = useStationAudit(stationId);
  if (!error) return null;
  if (!stale) return <FormError error={error} fallback="The change could not be saved." />;

  const latest = audit.data?.[0];
  const version = Math.max(latest?.versionAfter ?? 0, stale.currentVersion);
  const by = stale.changedBy ?? latest?.user?.name ?? 'another user';
  return (
    <Alert tone="danger" title="Your change was not saved">
      <p>
        Someone else changed the station (now version {version || '?'}, by {by}). Your change was not saved.
      </p>
      <p className="mt-1">Refused: {what}. Nothing was overwritten.</p>
      <div className="mt-3 flex flex-wrap gap-2">
        <Button size="sm" variant="secondary" onClick={onReload}>
          Reload the model
        </Button>
        {onReapply && version > 0 && (
          <Button
            size="sm"
            onClick={() => {
              onReload();
              onReapply(version);
            }}
          >
            Reload and re-apply my change
          </Button>
        )}
      </div>
    </Alert>
  );
}
