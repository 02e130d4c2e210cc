import { useMemo, useState } from 'react';
import { Controller, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { TaskCrewSchema, TaskSchema, type Task } from '@shared/schemas/plan';
import { focusRing } from '@/components/ui/button';
import { controlClass, Input } from '@/components/ui/input';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Select } from '@/components/ui/select';
import { cn } from '@/lib/cn';
import { durationField } from '../lib/form-fields';
import { durationText } from '../lib/plan-draft';
import type { PlanStationNodes, StationNodeOption } from '../types';

const TaskFormSchema = z.object({
  title: TaskSchema.shape.title,
  worksite: TaskSchema.shape.worksite,
  crew: TaskCrewSchema,
  duration: durationField(TaskSchema.shape.durationSeconds),
  eclipseOnly: z.boolean(),
  carrying: z.boolean(),
  socket: z.union([z.literal('').transform(() => undefined), TaskSchema.shape.socket.unwrap()]),
  tools: TaskSchema.shape.tools.unwrap(),
  notes: z.string().max(4000),
});

const nodeLabel = (n: StationNodeOption) => (n.label ? `${n.key} — ${n.label}` : n.key);
const distance = (a: StationNodeOption['position'], b: StationNodeOption['position']) =>
  Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

interface TaskFormProps {
  task?: Task;
  nodes: PlanStationNodes;
  toolNames: string[];
  onSubmit: (task: Task) => void;
  onCancel: () => void;
}

/** Add or edit one task; the worksite comes from a searchable list of the station's worksites. */
export function TaskForm({ task, nodes, toolNames, onSubmit, onCancel }: TaskFormProps) {
  const [search, setSearch] = useState('');
  const form = useZodForm(TaskFormSchema, {
    defaultValues: {
      title: task?.title ?? '',
      worksite: task?.worksite ?? '',
      crew: task?.crew ?? 'both',
      duration: task ? durationText(task.durationSeconds) : '0:30',
      eclipseOnly: task?.eclipseOnly ?? false,
      carrying: task?.carrying ?? false,
      socket: task?.socket ?? '',
      tools: task?.tools ?? [],
      notes: task?.notes ?? '',
    },
  });
  const {
    register,
    control,
    formState: { errors },
  } = form;
  const worksite = useWatch({ control, name: 'worksite' });
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
  const chips = [...new Set([...toolNames, ...(task?.tools ?? [])])];

  return (
    <Form
      form={form}
      onSubmit={(v) =>
        onSubmit({
          ...(task?.id === undefined ? {} : { id: task.id }),
          // what the form does not edit is kept as it was
          actions: task?.actions ?? [],
          ...(task?.sockets && v.crew === 'both' ? { sockets: task.sockets } : {}),
          title: v.title,
          worksite: v.worksite,
          crew: v.crew,
          durationSeconds: v.duration,
          eclipseOnly: v.eclipseOnly,
          carrying: v.carrying,
          ...(v.socket ? { socket: v.socket } : {}),
          tools: v.tools,
          ...(v.notes.trim() ? { notes: v.notes } : {}),
        })
      }
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
        <Field label="Duration" error={errors.duration?.message} hint="h:mm or minutes, e.g. 1:15 or 45">
          <Input autoComplete="off" {...register('duration')} />
        </Field>
      </div>
      <div className="flex flex-wrap gap-6">
        <label className="flex items-center gap-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('eclipseOnly')} />
          Eclipse only (must be done in orbital night)
        </label>
        <label className="flex items-center gap-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('carrying')} />
          Carrying a large item on the way
        </label>
      </div>
      <Field
        label="Foot-restraint socket"
        error={errors.socket?.message}
        hint={site ? 'Nearest to the worksite first' : undefined}
      >
        <Select
          options={[
            { value: '', label: 'No foot restraint' },
            ...sockets.map(({ s, d }) => ({
              value: s.key,
              label: site ? `${nodeLabel(s)} (${d.toFixed(1)} m away)` : nodeLabel(s),
            })),
          ]}
          {...register('socket')}
        />
      </Field>
      <fieldset>
        <legend className="mb-1.5 text-sm font-medium text-text-strong">Tools</legend>
        {chips.length === 0 ? (
          <p className="text-sm text-text-muted">The manifest is empty: add tools there to pick them here.</p>
        ) : (
          <Controller
            control={control}
            name="tools"
            render={({ field }) => (
              <div className="flex flex-wrap gap-2">
                {chips.map((name) => {
                  const on = field.value?.includes(name) ?? false;
                  const missing = !toolNames.includes(name);
                  return (
                    <button
                      key={name}
                      type="button"
                      aria-pressed={on}
                      onClick={() =>
                        field.onChange(
                          on ? field.value!.filter((t) => t !== name) : [...(field.value ?? []), name],
                        )
                      }
                      className={cn(
                        'rounded-full border px-3 py-1 text-sm',
                        focusRing,
                        on
                          ? 'border-accent bg-accent-soft font-medium text-accent-strong'
                          : 'border-surface-line bg-surface-panel text-text',
                      )}
                    >
                      <span aria-hidden="true">{on ? '✓ ' : '+ '}</span>
                      {name}
                      {missing && <span className="ml-1 text-danger">(not in manifest)</span>}
                    </button>
                  );
                })}
              </div>
            )}
          />
        )}
      </fieldset>
      <Field label="Notes" error={errors.notes?.message}>
        <textarea rows={2} className={cn(controlClass, 'py-2')} {...register('notes')} />
      </Field>
      <FormActions submit={task ? 'Apply changes' : 'Add task'} onCancel={onCancel} />
    </Form>
  );
}
