import { useId, useState } from 'react';
import type { PlanListItem } from '@shared/schemas/plan-views';
import type { SeriesView } from '@shared/schemas/series';
import { SERIES_PLANS_MAX } from '@shared/schemas/series';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { useCreateSeries } from '../api/edit-series';

/**
 * A new series: a title and its EVAs, ticked in the order they are flown (one station; plans already
 * in a series are not offered).
 */
export function CreateSeriesForm({
  plans,
  onCancel,
  onSuccess,
}: {
  /** the plans that may join: in no series yet */
  plans: readonly PlanListItem[];
  onCancel: () => void;
  onSuccess: (series: SeriesView) => void;
}) {
  const [title, setTitle] = useState('');
  const [chosen, setChosen] = useState<number[]>([]);
  const create = useCreateSeries({ onSuccess });
  const listId = useId();
  const station = chosen.length ? plans.find((p) => p.id === chosen[0])?.stationId : undefined;
  const toggle = (id: number) =>
    setChosen((ids) => (ids.includes(id) ? ids.filter((x) => x !== id) : [...ids, id]));
  const ready = title.trim() !== '' && chosen.length > 0;
  return (
    <form
      className="space-y-4"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (ready) create.mutate({ title: title.trim(), planIds: chosen });
      }}
    >
      <Field label="Series title" error={create.isError && !title.trim() ? 'required' : undefined}>
        <Input value={title} maxLength={200} onChange={(e) => setTitle(e.target.value)} autoFocus />
      </Field>
      <fieldset className="space-y-1.5">
        <legend id={listId} className="text-sm font-medium text-text-strong">
          EVAs, ticked in the order they are flown (one station, at most {SERIES_PLANS_MAX})
        </legend>
        {plans.length === 0 && <p className="text-sm text-text-muted">Every plan is in a series already.</p>}
        <ul aria-labelledby={listId} className="max-h-64 space-y-1 overflow-y-auto text-sm">
          {plans.map((p) => {
            const at = chosen.indexOf(p.id);
            const otherStation = station !== undefined && p.stationId !== station;
            return (
              <li key={p.id}>
                <label className="flex items-center gap-2">
                  <input
                    type="checkbox"
                    className="size-4 accent-accent"
                    checked={at >= 0}
                    disabled={(otherStation && at < 0) || (at < 0 && chosen.length >= SERIES_PLANS_MAX)}
                    onChange={() => toggle(p.id)}
                  />
                  <span className="w-12 text-xs text-text-muted">{at >= 0 ? `EVA ${at + 1}` : ''}</span>
                  <span>
                    {p.title} <span className="text-xs text-text-muted">· {p.stationName}</span>
                  </span>
                </label>
              </li>
            );
          })}
        </ul>
      </fieldset>
      <FormError error={create.error} fallback="The series could not be created." />
      <div className="flex justify-end gap-2">
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" disabled={!ready} isLoading={create.isPending}>
          Create series
        </Button>
      </div>
    </form>
  );
}
