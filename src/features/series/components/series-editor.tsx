import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { PlanListItem } from '@shared/schemas/plan-views';
import { SERIES_PLANS_MAX, type SeriesView } from '@shared/schemas/series';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Select } from '@/components/ui/select';
import { useUpdateSeries } from '../api/edit-series';
import { seriesKeys } from '../api/get-series';

/**
 * The series' EVAs changed in place: moved earlier or later, removed, or a plan added at the end.
 * Every change sends the whole new order with the version on screen (a stale one is refused and the
 * series read again); the server re-checks every EVA after it.
 */
export function useSeriesEdit(series: SeriesView) {
  const queryClient = useQueryClient();
  const update = useUpdateSeries();
  const ids = series.evas.map((e) => e.planId);
  const send = (planIds: number[]) =>
    update.mutate(
      { id: series.id, version: series.version, planIds },
      { onError: () => void queryClient.invalidateQueries({ queryKey: seriesKeys.detail(series.id) }) },
    );
  return {
    update,
    move: (index: number, by: -1 | 1) => {
      const next = [...ids];
      [next[index], next[index + by]] = [next[index + by], next[index]];
      send(next);
    },
    remove: (index: number) => send(ids.filter((_, i) => i !== index)),
    add: (planId: number) => send([...ids, planId]),
  };
}

export type SeriesEdit = ReturnType<typeof useSeriesEdit>;

/** Move and remove buttons on one EVA's card. */
export function EvaControls({ edit, index, count }: { edit: SeriesEdit; index: number; count: number }) {
  const busy = edit.update.isPending;
  const n = index + 1;
  return (
    <div className="mt-2 flex flex-wrap gap-1">
      <Button
        size="sm"
        variant="ghost"
        disabled={busy || index === 0}
        aria-label={`Move EVA ${n} earlier`}
        onClick={() => edit.move(index, -1)}
      >
        ← Earlier
      </Button>
      <Button
        size="sm"
        variant="ghost"
        disabled={busy || index === count - 1}
        aria-label={`Move EVA ${n} later`}
        onClick={() => edit.move(index, 1)}
      >
        Later →
      </Button>
      <Button
        size="sm"
        variant="ghost"
        disabled={busy || count === 1}
        aria-label={`Remove EVA ${n} from the series`}
        title={count === 1 ? 'A series keeps at least one EVA' : undefined}
        onClick={() => edit.remove(index)}
      >
        Remove
      </Button>
    </div>
  );
}

/** Adds a plan of the series' station that is in no series yet, as the last EVA. */
export function AddEva({ edit, candidates }: { edit: SeriesEdit; candidates: readonly PlanListItem[] }) {
  const [planId, setPlanId] = useState('');
  const full = edit.update.variables?.planIds?.length === SERIES_PLANS_MAX;
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-end gap-2">
        <div className="min-w-72">
          <Field label="Add a plan as the next EVA">
            <Select
              value={planId}
              onChange={(e) => setPlanId(e.target.value)}
              options={[
                {
                  value: '',
                  label: candidates.length ? 'Choose a plan…' : 'No plan of this station is free',
                },
                ...candidates.map((p) => ({ value: String(p.id), label: `${p.title} (${p.date})` })),
              ]}
            />
          </Field>
        </div>
        <Button
          disabled={!planId || full}
          isLoading={edit.update.isPending}
          onClick={() => {
            edit.add(Number(planId));
            setPlanId('');
          }}
        >
          Add EVA
        </Button>
      </div>
      <FormError error={edit.update.error} fallback="The series could not be changed." />
    </div>
  );
}
