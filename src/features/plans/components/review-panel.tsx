import { useId, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { can } from '@shared/auth/permissions';
import type { ReviewComment } from '@shared/schemas/plan';
import type { User } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { FormError } from '@/components/ui/form-error';
import { controlClass } from '@/components/ui/input';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { planKeys } from '../api/keys';
import { useReviewPlan, type ReviewStep } from '../api/review-plan';
import type { PlanView } from '../types';

const ACTION_WORDS: Record<ReviewComment['action'], string> = {
  submit: 'submitted for review',
  approve: 'approved',
  return: 'returned to draft',
  comment: 'commented',
};

const DONE: Record<ReviewStep, string> = {
  submit: 'Submitted for review. The other planners have been e-mailed.',
  approve: 'Approved. The author has been e-mailed.',
  return: 'Returned to draft.',
};

export function ReviewHistory({ comments }: { comments: ReviewComment[] }) {
  if (comments.length === 0) return <EmptyState>No review steps yet.</EmptyState>;
  return (
    <ol aria-label="Review history" className="space-y-2">
      {comments.map((c) => (
        <li key={c.id} className="rounded-md border border-surface-line px-3 py-2 text-sm">
          <p>
            <span className="font-medium text-text-strong">{c.authorName ?? 'Someone'}</span>{' '}
            {ACTION_WORDS[c.action]} <span className="text-text-muted">· {formatDateTime(c.createdAt)}</span>
          </p>
          {c.body && <p className="mt-1 whitespace-pre-line text-text">{c.body}</p>}
        </li>
      ))}
    </ol>
  );
}

interface ReviewPanelProps {
  plan: PlanView;
  user: User;
  /** the editor has changes the server has not saved yet */
  unsaved: boolean;
  /** why they are not saved, when it is more than a moment's wait (fields to fix) */
  unsavedText?: string;
}

export function ReviewPanel({ plan, user, unsaved, unsavedText }: ReviewPanelProps) {
  const queryClient = useQueryClient();
  const [comment, setComment] = useState('');
  const [done, setDone] = useState<string | null>(null);
  const commentId = useId();
  const review = useReviewPlan({
    onSuccess: (_plan, step) => {
      setComment('');
      setDone(DONE[step]);
    },
  });
  const isAuthor = plan.authorId === user.id;
  const changedIt = plan.editors.some((e) => e.id === user.id);
  const canSubmit = can(user, 'plans:submit') && plan.status === 'draft';
  const canReview = can(user, 'plans:review');
  const showApprove = canReview && plan.status === 'in-review';
  const showReturn = canReview && plan.status !== 'draft';
  const run = (step: ReviewStep) => {
    setDone(null);
    review.mutate(
      { id: plan.id, step, version: plan.version, comment: comment.trim() || undefined },
      // a stale version or a step someone else took first: show the plan as it is now
      { onError: () => void queryClient.invalidateQueries({ queryKey: planKeys.detail(plan.id) }) },
    );
  };

  return (
    <div className="space-y-4">
      <div aria-live="polite">{done && <Alert tone="success">{done}</Alert>}</div>
      <FormError error={review.error} fallback="The review step could not be saved." />
      {(canSubmit || showApprove || showReturn) && (
        <div className="space-y-3">
          <div className="space-y-1.5">
            <label htmlFor={commentId} className="block text-sm font-medium text-text-strong">
              Review comment{' '}
              {showReturn && !showApprove
                ? '(required to return)'
                : showReturn
                  ? '(required to return, optional to approve)'
                  : '(optional)'}
            </label>
            <textarea
              id={commentId}
              rows={3}
              value={comment}
              onChange={(e) => setComment(e.target.value)}
              className={cn(controlClass, 'py-2')}
            />
          </div>
          <div className="flex flex-wrap items-center gap-2">
            {canSubmit && (
              <Button
                onClick={() => run('submit')}
                disabled={unsaved || plan.tasks.length === 0}
                isLoading={review.isPending && review.variables?.step === 'submit'}
              >
                Submit for review
              </Button>
            )}
            {showApprove && (
              <Button
                onClick={() => run('approve')}
                disabled={isAuthor || changedIt}
                isLoading={review.isPending && review.variables?.step === 'approve'}
              >
                Approve
              </Button>
            )}
            {showReturn && (
              <Button
                variant="secondary"
                onClick={() => run('return')}
                disabled={!comment.trim()}
                isLoading={review.isPending && review.variables?.step === 'return'}
              >
                {isAuthor ? 'Withdraw to draft' : 'Return to draft'}
              </Button>
            )}
          </div>
          {canSubmit && unsaved && (
            <p className="text-sm text-caution">{unsavedText ?? 'Save your changes before submitting.'}</p>
          )}
          {canSubmit && !unsaved && plan.tasks.length === 0 && (
            <p className="text-sm text-text-muted">Add the day’s tasks before submitting the plan.</p>
          )}
          {showApprove && (isAuthor || changedIt) && (
            <p className="text-sm text-text-muted">
              {isAuthor ? 'You wrote this plan' : 'You changed this plan since it was last approved'}; a
              planner who did not change it must approve it.
            </p>
          )}
        </div>
      )}
      {!canSubmit && !canReview && plan.status === 'draft' && (
        <p className="text-sm text-text-muted">A planner submits this plan for review when it is ready.</p>
      )}
      <ReviewHistory comments={plan.reviewComments} />
    </div>
  );
}
