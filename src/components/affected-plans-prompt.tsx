import { Link } from 'react-router-dom';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import { paths } from '@/config/paths';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

const STATUS_WORDS: Record<AffectedPlan['status'], string> = {
  'in-review': 'in review',
  approved: 'approved',
};

/** A write's confirm and Cancel, under what it will do. */
export function InlineConfirm({
  label,
  isLoading,
  variant = 'primary',
  onConfirm,
  onCancel,
}: {
  label: string;
  isLoading: boolean;
  variant?: 'primary' | 'danger';
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <div className="mt-3 flex flex-wrap gap-2">
      <Button size="sm" variant={variant} isLoading={isLoading} onClick={onConfirm}>
        {label}
      </Button>
      <Button size="sm" variant="secondary" onClick={onCancel}>
        Cancel
      </Button>
    </div>
  );
}

/** The plans in review or approved a station change touches, each a link with its status. */
export function AffectedPlansList({ plans }: { plans: AffectedPlan[] }) {
  return (
    <ul className="mt-2 list-disc pl-5" aria-label="Affected plans">
      {plans.map((p) => (
        <li key={p.id}>
          <Link className="underline" to={paths.plan.getHref(p.id)}>
            {p.title}
          </Link>{' '}
          ({STATUS_WORDS[p.status]})
        </li>
      ))}
    </ul>
  );
}

/** What a change touching reviewed plans does to them, in one sentence. */
export function affectedPlansText(what: string, count: number) {
  const one = count === 1;
  return `To ${what} changes what ${one ? 'this plan' : 'these plans'} stand on. The change will be listed on ${one ? 'it' : 'them'} and ${one ? 'its author' : 'their authors'} mailed; an approved plan keeps the station version it was approved on until it is reviewed again.`;
}

interface AffectedPlansPromptProps {
  /** what the change is, e.g. "delete node PB3-A08" */
  what: string;
  plans: AffectedPlan[];
  isSaving: boolean;
  onConfirm: () => void;
  onCancel: () => void;
  confirmLabel?: string;
}

/** Asked before a station change that touches plans in review or approved: nothing is written until confirmed. */
export function AffectedPlansPrompt({
  what,
  plans,
  isSaving,
  onConfirm,
  onCancel,
  confirmLabel = 'Save the change anyway',
}: AffectedPlansPromptProps) {
  return (
    <Alert tone="caution" title="This change touches reviewed plans">
      <p>{affectedPlansText(what, plans.length)}</p>
      <AffectedPlansList plans={plans} />
      <InlineConfirm label={confirmLabel} isLoading={isSaving} onConfirm={onConfirm} onCancel={onCancel} />
    </Alert>
  );
}
