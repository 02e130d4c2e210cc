import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { isApiError } from '@/lib/api-client';
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

/** A stale-version refusal names the version in `details`; other 409s (a duplicate key) do not. */
export function staleVersionOf(error: unknown): { version: number; by: string | null } | null {
  if (!isApiError(error) || error.status !== 409) return null;
  const detail = error.details.find((d) => d.path === 'version');
  if (!detail) return null;
  const version = /(\d+)/.exec(detail.message) ?? /now version (\d+)/i.exec(error.message);
  const by = /changed by (.+?)(?: at |[.,]|$)/.exec(error.message);
  return { version: version ? Number(version[1]) : 0, by: by ? by[1] : null };
}

/** A refused edit: a stale version (409) says who changed the station; anything else shows the server's message. */
export function ConflictNotice({ error, stationId, what, onReload, onReapply }: ConflictNoticeProps) {
  const stale = staleVersionOf(error);
  const audit = useStationAudit(stationId);
  if (!error) return null;
  if (!stale) return <FormError error={error} fallback="The change could not be saved." />;

  const latest = audit.data?.[0];
  const version = Math.max(latest?.versionAfter ?? 0, stale.version);
  const by = stale.by ?? latest?.user?.name ?? 'another user';
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
