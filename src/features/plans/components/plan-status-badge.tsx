import type { PlanStatus } from '@shared/schemas/plan';
import { Badge, type BadgeTone } from '@/components/ui/badge';

export const STATUS_LABELS: Record<PlanStatus, string> = {
  draft: 'Draft',
  'in-review': 'In review',
  approved: 'Approved',
};

const STATUS_LOOK: Record<PlanStatus, { tone: BadgeTone; mark: string }> = {
  draft: { tone: 'draft', mark: '✎' },
  'in-review': { tone: 'review', mark: '◔' },
  approved: { tone: 'approved', mark: '✓' },
};

export function PlanStatusBadge({ status }: { status: PlanStatus }) {
  const look = STATUS_LOOK[status];
  return (
    <Badge tone={look.tone}>
      <span aria-hidden="true" className="mr-1">
        {look.mark}
      </span>
      {STATUS_LABELS[status]}
    </Badge>
  );
}
