import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { UpdatePlanInputSchema } from '@shared/schemas/plan';
import { staleVersionOf } from '@/lib/api-client';
import { getPlan } from '../api/get-plan';
import { planKeys } from '../api/keys';
import { useUpdatePlan } from '../api/update-plan';
import type { PlanView } from '../types';
import { describeDifferences, draftChanges, draftFromPlan, type PlanDraft } from './plan-draft';

/**
 * An editing burst ends when the planner stops for this long; its edits go out as one save, so the
 * plan's version counts bursts of work, not keystrokes.
 */
export const AUTOSAVE_IDLE_MS = 2500;
/** A burst that never pauses is still saved this often after its first edit. */
export const AUTOSAVE_MAX_WAIT_MS = 20_000;
/** A save sent as the page goes (keepalive) carries at most 64 KiB; a larger one asks first instead. */
const KEEPALIVE_MAX_CHARS = 60_000;

export interface PlanConflict {
  version: number;
  changedBy: string | null;
  differences: string[];
  current: PlanView;
}

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'invalid' | 'conflict' | 'error';

/**
 * The editor's working copy of a plan, saved by PATCH when an editing burst ends (a pause, at most
 * `AUTOSAVE_MAX_WAIT_MS` after its first edit), when the page is hidden, and as it is left (`keep`).
 * A stale version stops saving and reports what the server's plan has that the draft does not;
 * nothing is sent over it until the planner reloads.
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

  /** when the first edit not yet sent was made (null: none) */
  const burstStart = useRef<number | null>(null);
  const [edits, setEdits] = useState(0);
  /** the version the last save was sent from */
  const sentFrom = useRef<number | null>(null);

  /** Sends the draft's changes now; false when there is nothing it may send. */
  const save = useCallback(
    ({ keepalive = false }: { keepalive?: boolean } = {}) => {
      if (!changes || invalidCount || update.isPending || conflict || !editable) return false;
      // a save from this base is on its way (the pending state has not rendered yet): never twice
      if (sentFrom.current === base.version) return false;
      if (keepalive && JSON.stringify(changes).length > KEEPALIVE_MAX_CHARS) return false;
      const sent = draft;
      burstStart.current = null;
      sentFrom.current = base.version;
      update.mutate(
        { id: plan.id, data: changes, keepalive },
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
            sentFrom.current = null;
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
      return true;
    },
    [changes, invalidCount, update, conflict, editable, draft, plan.id, base.version],
  );
  const latestSave = useRef(save);
  useEffect(() => {
    latestSave.current = save;
  });

  // one timer per burst: restarted by each edit, not by renders that change nothing
  const savable = !!changes && !invalidCount && !update.isPending && !conflict && editable && !update.isError;
  useEffect(() => {
    if (!savable) return;
    const since = burstStart.current ?? Date.now();
    const wait = Math.min(AUTOSAVE_IDLE_MS, Math.max(0, since + AUTOSAVE_MAX_WAIT_MS - Date.now()));
    const timer = setTimeout(() => latestSave.current(), wait);
    return () => clearTimeout(timer);
  }, [edits, savable]);

  // a hidden tab may never come back (closed, discarded): its edits go out at once
  useEffect(() => {
    const hidden = () => {
      if (document.visibilityState === 'hidden') latestSave.current({ keepalive: true });
    };
    document.addEventListener('visibilitychange', hidden);
    return () => document.removeEventListener('visibilitychange', hidden);
  }, []);

  const change = useCallback(
    (patch: Partial<PlanDraft>) => {
      if (update.isError) update.reset();
      burstStart.current ??= Date.now();
      setEdits((n) => n + 1);
      setDraft((d) => ({ ...d, ...patch }));
    },
    [update],
  );

  /** Sends what is not saved as the page is left (the request outlives the page); false: ask first. */
  const keep = useCallback(() => latestSave.current({ keepalive: true }), []);

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
    keep,
    reload,
    conflict,
    state,
    error: update.error,
    invalid,
    invalidCount,
    savedVersion: base.version,
  };
}
