import { Link } from 'react-router-dom';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import { paths } from '@/config/paths';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

interface AffectedPlansPromptProps {
  /** what the change is, e.g. "delete node PB3-A08" */
  what: string;
  plans: AffectedPlan[];
  isSaving: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}

const STATUS_WORDS: Record<AffectedPlan['status'], string> = {
  'in-review': 'in review',
  approved: 'approved',
};

/** Asked before a station change that touches plans in review or approved: nothing is written until confirmed. */
export function AffectedPlansPrompt({
  what,
  plans,
  isSaving,
  onConfirm,
  onCancel,
}: AffectedPlansPromptProps) {
  return (
    <Alert tone="caution" title="This change touches reviewed plans">
      <p>
        To {what} changes what {plans.length === 1 ? 'this plan' : 'these plans'} stand on. The change will be
        listed on {plans.length === 1 ? 'it' : 'them'} and{' '}
        {plans.length === 1 ? 'its author' : 'their authors'} mailed; an approved plan keeps the station
        version it was approved on until it is reviewed again.
      </p>
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
      <div className="mt-3 flex flex-wrap gap-2">
        <Button size="sm" disabled={isSaving} onClick={onConfirm}>
          Save the change anyway
        </Button>
        <Button size="sm" variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </Alert>
  );
}
