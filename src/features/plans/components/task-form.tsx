import { useLayoutEffect, useMemo, useState } from 'react';
import { Controller, useWatch } from 'react-hook-form';
import type { ManifestItem, Task } from '@shared/schemas/plan';
import { flownEstimateFor, type FlownEstimate } from '@shared/compute/day/flown-estimates';
import { formatMinutes } from '@shared/compute/units';
import { Button } from '@/components/ui/button';
import { controlClass, Input } from '@/components/ui/input';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Select } from '@/components/ui/select';
import { cn } from '@/lib/cn';
import { taskFormDefaults, taskFormSchema } from '../lib/task-form-schema';
import type { PlanStationNodes, StationNodeOption } from '../types';
import { AfterChips, type OtherTask } from './after-chips';
import { ItemActionsField, type PlaceOption } from './item-actions-field';
import { ToolChips } from './tool-chips';

const nodeLabel = (n: StationNodeOption) => (n.label ? `${n.key} — ${n.label}` : n.key);
const distance = (a: StationNodeOption['position'], b: StationNodeOption['position']) =>
  Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
/** Places offered for an item action: the nodes this close to the worksite. */
const PLACE_RADIUS_M = 15;
const MAX_PLACES = 40;

interface TaskFormProps {
  task?: Task;
  /** the plan's other tasks, to start after */
  others: readonly OtherTask[];
  nodes: PlanStationNodes;
  /** the plan's manifest: items to act on and to need at hand */
  manifest: readonly ManifestItem[];
  /** the task, and the items named in it that go on the manifest */
  onSubmit: (task: Task, added: ManifestItem[]) => void;
  onCancel: () => void;
  /** what tasks took in runs that ended: a matching one is offered as the duration, never applied */
  flownEstimates?: readonly FlownEstimate[];
  /** whether the form holds edits not applied yet, so closing it can ask first */
  onDirtyChange?: (dirty: boolean) => void;
}

/**
 * Add or edit one task: where (a searchable list of the station's worksites), who, how long, each
 * member's foot restraint, what it needs at hand and what it does with the manifest's items.
 */
export function TaskForm({
  task,
  others,
  nodes,
  manifest,
  onSubmit,
  onCancel,
  flownEstimates,
  onDirtyChange,
}: TaskFormProps) {
  const [search, setSearch] = useState('');
  const [added, setAdded] = useState<ManifestItem[]>([]);
  const known = useMemo(() => [...manifest, ...added], [manifest, added]);
  // the form reads its resolver on every render, so items added meanwhile count when it is checked
  const schema = useMemo(() => taskFormSchema(known), [known]);
  const form = useZodForm(schema, { defaultValues: taskFormDefaults(task, manifest) });
  const dirty = form.formState.isDirty;
  // a layout effect: the owner knows before the next key (an Escape right behind an edit asks)
  useLayoutEffect(() => onDirtyChange?.(dirty), [dirty, onDirtyChange]);
  const {
    register,
    control,
    formState: { errors },
  } = form;
  const worksite = useWatch({ control, name: 'worksite' });
  const title = useWatch({ control, name: 'title' });
  const flown = flownEstimateFor(flownEstimates ?? [], title ?? '', worksite ?? '');
  const crew = useWatch({ control, name: 'crew' });
  const armKey = useWatch({ control, name: 'arm.key' });
  const arms = nodes.arms ?? [];
  const needle = search.trim().toLowerCase();
  const worksites = nodes.worksites.filter(
    (n) =>
      !needle ||
      n.key.toLowerCase().includes(needle) ||
      n.label?.toLowerCase().includes(needle) ||
      n.key === worksite,
  );
  const site = nodes.worksites.find((n) => n.key === worksite);
  // nearest sockets first: the planner picks from the few that can plausibly reach
  const sockets = useMemo(
    () =>
      [...nodes.sockets]
        .map((s) => ({ s, d: site ? distance(s.position, site.position) : 0 }))
        .sort((a, b) => a.d - b.d || a.s.key.localeCompare(b.s.key)),
    [nodes.sockets, site],
  );
  const socketOptions = (none: string) => [
    { value: '', label: none },
    ...sockets.map(({ s, d }) => ({
      value: s.key,
      label: site ? `${nodeLabel(s)} (${d.toFixed(1)} m away)` : nodeLabel(s),
    })),
  ];
  const places: PlaceOption[] = useMemo(() => {
    if (!site) return [];
    return (nodes.all ?? [...nodes.worksites, ...nodes.sockets])
      .map((n) => ({ n, d: distance(n.position, site.position) }))
      .filter((x) => x.d <= PLACE_RADIUS_M)
      .sort((a, b) => a.d - b.d)
      .slice(0, MAX_PLACES)
      .map(({ n, d }) => ({ key: n.key, note: `${n.kind ?? 'node'}, ${d.toFixed(1)} m away` }));
  }, [nodes, site]);
  const socketHint = site ? 'Nearest to the worksite first' : undefined;

  return (
    <Form
      form={form}
      onSubmit={(v) => {
        // an item added here and then not needed stays off the manifest
        const used = new Set([...v.tools, ...v.actions.map((a) => a.item)]);
        onSubmit(
          { ...(task?.id === undefined ? {} : { id: task.id }), ...v },
          added.filter((m) => used.has(m.key!)),
        );
      }}
    >
      <Field label="Task title" error={errors.title?.message}>
        <Input autoComplete="off" {...register('title')} />
      </Field>
      <div className="space-y-1.5">
        <Field
          label="Find a worksite"
          hint={`${worksites.length} of ${nodes.worksites.length} worksites shown`}
        >
          <Input
            type="search"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            placeholder="key or name"
          />
        </Field>
        <Field label="Worksite" error={errors.worksite?.message}>
          <select
            size={Math.min(6, Math.max(2, worksites.length))}
            className={cn(controlClass, 'py-1')}
            {...register('worksite')}
          >
            {worksites.map((n) => (
              <option key={n.key} value={n.key}>
                {nodeLabel(n)}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Crew" error={errors.crew?.message}>
          <Select
            options={[
              { value: 'EV1', label: 'EV1' },
              { value: 'EV2', label: 'EV2' },
              { value: 'both', label: 'Both (EV1 and EV2 together)' },
            ]}
            {...register('crew')}
          />
        </Field>
        <div className="space-y-2">
          <Field label="Duration" error={errors.duration?.message} hint="h:mm or minutes, e.g. 1:15 or 45">
            <Input autoComplete="off" {...register('duration')} />
          </Field>
          {flown && (
            <p
              className="flex flex-wrap items-center gap-2 text-sm text-text-muted"
              data-testid="flown-estimate"
            >
              Flown here: {formatMinutes(flown.seconds)} (median of {flown.flights} run
              {flown.flights === 1 ? '' : 's'}, {formatMinutes(flown.minSeconds)}–
              {formatMinutes(flown.maxSeconds)})
              <Button
                variant="secondary"
                size="sm"
                onClick={() =>
                  form.setValue('duration', String(Math.max(1, Math.round(flown.seconds / 60))), {
                    shouldDirty: true,
                    shouldValidate: true,
                  })
                }
              >
                Use {formatMinutes(flown.seconds)}
              </Button>
            </p>
          )}
        </div>
      </div>
      <div className="flex flex-wrap gap-6">
        <label className="flex items-center gap-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('eclipseOnly')} />
          Eclipse-only (done inside a night window)
        </label>
        <label className="flex items-center gap-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('carrying')} />
          Carrying a large item on the way
        </label>
        <label className="flex items-center gap-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('optional')} />
          Optional (get-ahead work that can be dropped)
        </label>
      </div>
      {arms.length > 0 && (
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="mb-1.5 text-sm font-medium text-text-strong">Robotic arm</legend>
          <Field label="Done from an arm" error={errors.arm?.key?.message}>
            <Select
              options={[
                { value: '', label: 'No arm' },
                ...arms.map((a) => ({
                  value: a.key,
                  label: `${a.key}${a.label ? ` — ${a.label}` : ''} (on ${a.baseNode})`,
                })),
              ]}
              {...register('arm.key')}
            />
          </Field>
          {armKey && crew === 'both' && (
            <Field label="Arm rider" error={errors.arm?.rider?.message}>
              <Select
                options={[
                  { value: '', label: 'EV1 (default)' },
                  { value: 'EV1', label: 'EV1' },
                  { value: 'EV2', label: 'EV2' },
                ]}
                {...register('arm.rider')}
              />
            </Field>
          )}
          {armKey && (
            <>
              <Field
                label="Gets on at"
                error={errors.arm?.ingress?.message}
                hint="node key where the rider gets onto the arm"
              >
                <Input autoComplete="off" className="font-mono" {...register('arm.ingress')} />
              </Field>
              <Field
                label="Gets off at"
                error={errors.arm?.egress?.message}
                hint="an attach point; blank: where they got on"
              >
                <Input autoComplete="off" className="font-mono" {...register('arm.egress')} />
              </Field>
            </>
          )}
        </fieldset>
      )}
      {armKey && crew !== 'both' ? null : crew === 'both' ? (
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="mb-1.5 text-sm font-medium text-text-strong">
            Foot restraints (one person each)
          </legend>
          <Field label="EV1 foot restraint" error={errors.sockets?.EV1?.message} hint={socketHint}>
            <Select options={socketOptions('Works from handrails')} {...register('sockets.EV1')} />
          </Field>
          <Field label="EV2 foot restraint" error={errors.sockets?.EV2?.message}>
            <Select options={socketOptions('Works from handrails')} {...register('sockets.EV2')} />
          </Field>
        </fieldset>
      ) : (
        <Field label="Foot-restraint socket" error={errors.socket?.message} hint={socketHint}>
          <Select options={socketOptions('No foot restraint')} {...register('socket')} />
        </Field>
      )}
      <Controller
        control={control}
        name="tools"
        render={({ field, fieldState }) => (
          <ToolChips
            value={field.value}
            onChange={field.onChange}
            manifest={known}
            crew={crew}
            onAddItem={(item) => setAdded((list) => [...list, item])}
            error={fieldState.error?.message}
          />
        )}
      />
      <Controller
        control={control}
        name="after"
        render={({ field }) => <AfterChips value={field.value} onChange={field.onChange} others={others} />}
      />
      <ItemActionsField form={form} manifest={known} places={places} />
      <Field label="Notes" error={errors.notes?.message}>
        <textarea rows={2} className={cn(controlClass, 'py-2')} {...register('notes')} />
      </Field>
      <FormActions submit={task ? 'Apply changes' : 'Add task'} onCancel={onCancel} />
    </Form>
  );
}
