import { EmptyState } from '@/components/ui/card';
import { FormError } from '@/components/ui/form-error';
import { Spinner } from '@/components/ui/spinner';
import { formatDateTime } from '@/lib/format';
import { useStationAudit } from '../api/get-station-audit';

const VERBS: Record<string, string> = { create: 'added', update: 'changed', delete: 'deleted' };

/** `node.create` → `added node`; unknown actions are shown with their parts. */
export function describeAuditAction(action: string): string {
  const [what, verb] = action.split('.');
  return verb ? `${VERBS[verb] ?? verb.replace(/[-_]/g, ' ')} ${what}` : action.replace(/[-_.]/g, ' ');
}

/** Recent edits of the station model: who, what, when, and the version each made. */
export function AuditList({ stationId }: { stationId: number }) {
  const audit = useStationAudit(stationId);
  if (audit.isPending) return <Spinner label="Loading recent edits" />;
  if (audit.isError)
    return <FormError error={audit.error} fallback="The recent edits could not be loaded." />;
  if (!audit.data.length) return <EmptyState>No edits yet.</EmptyState>;
  return (
    <ol className="divide-y divide-surface-line text-sm" aria-label="Recent edits">
      {audit.data.map((entry) => (
        <li key={entry.id} className="py-2">
          <p className="text-text-strong">
            <span className="font-medium">{entry.user?.name ?? 'Someone'}</span>{' '}
            {describeAuditAction(entry.action)}
            {entry.target && <span className="font-mono"> {entry.target}</span>}
          </p>
          <p className="text-xs text-text-muted">
            <time dateTime={entry.createdAt}>{formatDateTime(entry.createdAt)}</time> · version{' '}
            {entry.versionAfter}
          </p>
        </li>
      ))}
    </ol>
  );
}
