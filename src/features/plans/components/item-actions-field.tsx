import { useId } from 'react';
import { useFieldArray, useWatch, type UseFormReturn } from 'react-hook-form';
import { ITEM_ACTIONS, MAX_ACTIONS_PER_TASK, type ManifestItem } from '@shared/schemas/plan';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { ACTION_NAMES, type TaskFormTask, type TaskFormValues } from '../lib/task-form-schema';

export interface PlaceOption {
  key: string;
  /** e.g. "socket, 1.2 m away" */
  note: string;
}

interface ItemActionsFieldProps {
  form: UseFormReturn<TaskFormValues, unknown, TaskFormTask>;
  manifest: readonly ManifestItem[];
  /** nodes offered for `at`, nearest to the worksite first */
  places: readonly PlaceOption[];
}

/**
 * What the task does with the manifest's items: one row per action (what, which item, who, where).
 * The rules between actions, the task and the manifest show on the fields they concern.
 */
export function ItemActionsField({ form, manifest, places }: ItemActionsFieldProps) {
  const { control, register, formState } = form;
  const { fields, append, remove } = useFieldArray({ control, name: 'actions' });
  const crew = useWatch({ control, name: 'crew' });
  const rows = useWatch({ control, name: 'actions' }) ?? [];
  const listId = useId();
  const errors = formState.errors.actions;
  const keyed = manifest.filter((m): m is ManifestItem & { key: string } => !!m.key);
  const itemOptions = (current: string) => [
    { value: '', label: 'Choose an item…' },
    ...keyed.map((m) => ({ value: m.key, label: `${m.name} (${m.key})` })),
    // an action naming an item no longer on the manifest keeps its key, so the error says which
    ...(current && !keyed.some((m) => m.key === current)
      ? [{ value: current, label: `${current} (not in manifest)` }]
      : []),
  ];

  return (
    <fieldset className="space-y-2">
      <legend className="mb-1.5 text-sm font-medium text-text-strong">Item actions</legend>
      <p className="text-xs text-text-muted">
        Checked when the work starts, done when it ends. Where: blank means the worksite, or for a foot
        restraint the socket the member works from.
      </p>
      <datalist id={listId}>
        {places.map((p) => (
          <option key={p.key} value={p.key}>
            {p.note}
          </option>
        ))}
      </datalist>
      {fields.length > 0 && (
        <ol className="space-y-2" aria-label="Item actions">
          {fields.map((f, i) => {
            const e = errors?.[i];
            const handOver = rows[i]?.do === 'hand-over';
            return (
              <li
                key={f.id}
                className="grid gap-2 rounded-md border border-surface-line p-2 sm:grid-cols-[9rem_minmax(0,1fr)_6rem_8rem_auto]"
              >
                <Field label={`Action ${i + 1}`} error={e?.do?.message}>
                  <Select
                    options={ITEM_ACTIONS.map((a) => ({ value: a, label: ACTION_NAMES[a] }))}
                    {...register(`actions.${i}.do`)}
                  />
                </Field>
                <Field label="Item" error={e?.item?.message}>
                  <Select options={itemOptions(rows[i]?.item ?? '')} {...register(`actions.${i}.item`)} />
                </Field>
                {crew === 'both' ? (
                  <Field label="By" error={e?.by?.message}>
                    <Select
                      options={[
                        { value: '', label: 'Who?' },
                        { value: 'EV1', label: 'EV1' },
                        { value: 'EV2', label: 'EV2' },
                      ]}
                      {...register(`actions.${i}.by`)}
                    />
                  </Field>
                ) : (
                  <div className="space-y-1.5">
                    <p className="text-sm font-medium text-text-strong">By</p>
                    <p className="flex h-10 items-center text-sm text-text">{crew}</p>
                  </div>
                )}
                <Field label="Where" error={e?.at?.message}>
                  <Input
                    list={listId}
                    autoComplete="off"
                    readOnly={handOver}
                    className="read-only:bg-surface-sunken"
                    placeholder={handOver ? 'hand to hand' : 'worksite'}
                    {...register(`actions.${i}.at`)}
                  />
                </Field>
                <div className="flex items-end pb-0.5">
                  <Button
                    variant="ghost"
                    size="sm"
                    className="text-danger"
                    aria-label={`Remove action ${i + 1}`}
                    onClick={() => remove(i)}
                  >
                    Remove
                  </Button>
                </div>
              </li>
            );
          })}
        </ol>
      )}
      {errors?.message && <p className="text-sm text-danger">{errors.message}</p>}
      <Button
        variant="secondary"
        size="sm"
        disabled={fields.length >= MAX_ACTIONS_PER_TASK || keyed.length === 0}
        onClick={() => append({ do: 'pick-up', item: '', by: '', at: '' })}
      >
        Add an item action
      </Button>
      {keyed.length === 0 && (
        <p className="text-xs text-text-muted">Put items on the manifest to act on them here.</p>
      )}
    </fieldset>
  );
}
