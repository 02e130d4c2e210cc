import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import type { User } from '@shared/schemas/auth';
import { can } from '@shared/auth/permissions';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { FormError } from '@/components/ui/form-error';
import { paths } from '@/config/paths';
import { useDeletePlan, useDuplicatePlan } from '../api/delete-plan';
import type { PlanView } from '../types';

/**
 * Duplicate (a new draft with the same tasks and manifest, opened at once) and delete (drafts only,
 * asked first; the version on screen is sent, so a plan changed meanwhile is refused).
 */
export function PlanActions({
  plan,
  user,
  onDeleted,
}: {
  plan: PlanView;
  user: User;
  /** the plan is gone: the caller lets the page go without asking about unsaved edits */
  onDeleted?: () => void;
}) {
  const navigate = useNavigate();
  const [asking, setAsking] = useState(false);
  const remove = useDeletePlan({
    onSuccess: () => {
      onDeleted?.();
      void navigate(paths.plans.getHref());
    },
  });
  const duplicate = useDuplicatePlan({ onSuccess: (copy) => void navigate(paths.plan.getHref(copy.id)) });
  if (!can(user, 'plans:edit')) return null;
  return (
    <>
      <Button
        size="sm"
        variant="secondary"
        isLoading={duplicate.isPending}
        onClick={() => duplicate.mutate({ id: plan.id })}
      >
        Duplicate
      </Button>
      {plan.status === 'draft' && (
        <Button
          size="sm"
          variant="secondary"
          onClick={() => {
            remove.reset();
            setAsking(true);
          }}
        >
          Delete…
        </Button>
      )}
      <FormError error={duplicate.error} fallback="The plan could not be duplicated." />
      <ConfirmDialog
        open={asking}
        title={`Delete “${plan.title}”?`}
        confirmLabel="Delete plan"
        isLoading={remove.isPending}
        onCancel={() => setAsking(false)}
        onConfirm={() => remove.mutate({ id: plan.id, version: plan.version })}
      >
        <p>
          The draft, its tasks, manifest and review history go for good. Walkthroughs rehearsing it go with
          it; a series it is an EVA of keeps its other EVAs.
        </p>
        <FormError error={remove.error} fallback="The plan could not be deleted." />
      </ConfirmDialog>
    </>
  );
}
