import type { Viewer } from '@shared/schemas/events';
import { ROLE_LABELS, type Role } from '@shared/auth/permissions';

/** Who else has this plan open now (the person looking is left out). */
export function PresenceList({ viewers, selfId }: { viewers: Viewer[]; selfId: number }) {
  const others = viewers.filter((v) => v.userId !== selfId);
  return (
    <p aria-live="polite" data-testid="presence" className="flex items-center gap-2 text-sm text-text-muted">
      <span
        className={
          others.length ? 'size-2 rounded-full bg-status-approved' : 'size-2 rounded-full bg-ink-300'
        }
      />
      {others.length === 0
        ? 'No one else has this plan open'
        : `Also looking: ${others.map((v) => `${v.name} (${ROLE_LABELS[v.role as Role] ?? v.role})`).join(', ')}`}
    </p>
  );
}
