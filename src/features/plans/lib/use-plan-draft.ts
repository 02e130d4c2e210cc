import { useCallback, useEffect, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { UpdatePlanInputSchema } from '@shared/schemas/plan';
import { staleVersionOf } from '@/lib/api-client';
import { getPlan } from '../api/get-plan';
import { planKeys } from '../api/keys';
import { useUpdatePlan } from '../api/update-plan';
import type { PlanView } from '../types';
import { describeDifferences, draftChanges, draftFromPlan, type PlanDraft } from './plan-draft';

/** Pause after the last keystroke before a save goes out. */
export const AUTOSAVE_DELAY_MS = 700;

export interface PlanConflict {
  version: number;
  changedBy: string | null;
  differences: string[];
  current: PlanView;
}

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'invalid' | 'conflict' | 'error';

/**
 * The editor's working copy of a plan, saved by PATCH a moment after each change. A stale version
 * stops saving and reports what the server's plan has that the draft does not; nothing is sent
 * over it until the planner reloads.
 */
export function usePlanDraft(
  plan: PlanView,
  editable: boolean,
  /** fields on the page holding text that does not read as a value (not in the draft, so not saved) */
  unreadableFields = 0,
) {
  const queryClient = useQueryClient();
  const [draft, setDraft] = useState(() => draftFromPlan(plan));
  const [base, setBase] = useState(() => ({ draft: draftFromPlan(plan), version: plan.version }));
  const [conflict, setConflict] = useState<PlanConflict | null>(null);
  const update = useUpdatePlan();

  const changes = draftChanges(base.draft, draft, base.version);
  const parsed = changes ? UpdatePlanInputSchema.safeParse(changes) : null;
  const invalid = parsed && !parsed.success ? parsed.error.issues : null;
  /** fields to fix before anything is saved: the draft's own and those the page could not read */
  const invalidCount = (invalid?.length ?? 0) + unreadableFields;

  // a review step or a reload elsewhere: take the server's plan when nothing here is unsaved
  const [seenVersion, setSeenVersion] = useState(plan.version);
  if (plan.version !== seenVersion && !update.isPending) {
    setSeenVersion(plan.version);
    if (plan.version > base.version && (!changes || !editable)) {
      setBase({ draft: draftFromPlan(plan), version: plan.version });
      setDraft(draftFromPlan(plan));
    }
  }

  const save = useCallback(() => {
    if (!changes || invalidCount || update.isPending || conflict || !editable) return;
    const sent = draft;
    update.mutate(
      { id: plan.id, data: changes },
      {
        onSuccess: (saved) => {
          // new tasks get their ids from the save, so other tasks can name them in `after`
          const withId = (t: PlanDraft['tasks'][number]) => {
            const k = sent.tasks.indexOf(t);
            const id = k >= 0 && t.id === undefined ? saved.tasks[k]?.id : undefined;
            return id === undefined ? t : { ...t, id };
          };
          setBase({ draft: { ...sent, tasks: sent.tasks.map(withId) }, version: saved.version });
          setDraft((d) => ({ ...d, tasks: d.tasks.map(withId) }));
        },
        onError: async (error) => {
          const stale = staleVersionOf(error);
          if (!stale) return;
          const current = await getPlan(plan.id);
          setConflict({
            version: current.version,
            changedBy: stale.changedBy,
            differences: describeDifferences(sent, draftFromPlan(current)),
            current,
          });
        },
      },
    );
  }, [changes, invalidCount, update, conflict, editable, draft, plan.id]);

  useEffect(() => {
    if (!changes || invalidCount || update.isPending || conflict || !editable || update.isError) return;
    const timer = setTimeout(save, AUTOSAVE_DELAY_MS);
    return () => clearTimeout(timer);
  }, [changes, invalidCount, update.isPending, update.isError, conflict, editable, save]);

  const change = useCallback(
    (patch: Partial<PlanDraft>) => {
      if (update.isError) update.reset();
      setDraft((d) => ({ ...d, ...patch }));
    },
    [update],
  );

  /** Drops the draft for the server's current plan. */
  const reload = () => {
    const current = conflict?.current ?? plan;
    queryClient.setQueryData(planKeys.detail(current.id), current);
    void queryClient.invalidateQueries({ queryKey: planKeys.timeline(current.id) });
    setBase({ draft: draftFromPlan(current), version: current.version });
    setDraft(draftFromPlan(current));
    setConflict(null);
    update.reset();
  };

  const state: SaveState = conflict
    ? 'conflict'
    : update.isPending
      ? 'saving'
      : update.isError
        ? 'error'
        : invalidCount
          ? 'invalid'
          : changes
            ? 'unsaved'
            : 'saved';

  return {
    draft,
    change,
    save,
    reload,
    conflict,
    state,
    error: update.error,
    invalid,
    invalidCount,
    savedVersion: base.version,
  };
}
