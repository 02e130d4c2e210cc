import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import type { PlanStatus } from '@shared/schemas/plan';
import { ROUTE_MODES } from '@shared/schemas/route';
import {
  CreateWalkthroughInputSchema,
  WalkthroughRouteSpecSchema,
  type WalkthroughDetail,
} from '@shared/schemas/walkthrough';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { useCreateWalkthrough } from '../api/create-walkthrough';

export interface PlanChoice {
  id: number;
  title: string;
  stationId: number;
  stationName: string;
  status: PlanStatus;
}

export interface StationChoice {
  id: number;
  name: string;
}

const { name: NameSchema } = CreateWalkthroughInputSchema.shape;
const PickedIdSchema = z.number({ error: 'pick one' }).int().positive('pick one');

// the same fields the server parses, with the plan-or-route choice made explicit for the form
const FormSchema = z.discriminatedUnion('source', [
  z.object({ source: z.literal('plan'), name: NameSchema, planId: PickedIdSchema }),
  z.object({
    source: z.literal('route'),
    name: NameSchema,
    stationId: PickedIdSchema,
    route: WalkthroughRouteSpecSchema.extend({
      // an empty field means "the station's default tether"
      tetherLengthM: WalkthroughRouteSpecSchema.shape.tetherLengthM.or(z.nan().transform(() => undefined)),
    }),
  }),
]);
type FormInput = z.input<typeof FormSchema>;
type FormOutput = z.output<typeof FormSchema>;

const MODE_LABELS: Record<(typeof ROUTE_MODES)[number], string> = {
  fastest: 'Fastest',
  'fewest-swaps': 'Fewest tether swaps',
  balanced: 'Balanced',
};

export function NewWalkthroughForm({
  plans,
  stations,
  defaultPlanId,
  onSuccess,
  onCancel,
}: {
  plans: readonly PlanChoice[];
  stations: readonly StationChoice[];
  defaultPlanId?: number;
  onSuccess: (detail: WalkthroughDetail) => void;
  onCancel: () => void;
}) {
  const create = useCreateWalkthrough({ onSuccess });
  const preset = plans.find((p) => p.id === defaultPlanId);
  const form = useZodForm(FormSchema, {
    defaultValues: {
      source: 'plan',
      name: preset ? `Rehearsal: ${preset.title}` : '',
      planId: preset?.id ?? Number.NaN,
    } as FormInput,
  });
  const {
    register,
    control,
    setValue,
    getValues,
    formState: { errors },
  } = form;
  const source = useWatch({ control, name: 'source' });
  // errors of the branch not shown are not reachable; read them loosely
  const e = errors as Partial<Record<string, { message?: string } & Record<string, { message?: string }>>>;

  const submit = (values: FormOutput) => {
    if (values.source === 'plan') {
      const plan = plans.find((p) => p.id === values.planId)!;
      create.mutate({ name: values.name, stationId: plan.stationId, planId: plan.id });
    } else {
      create.mutate({ name: values.name, stationId: values.stationId, route: values.route });
    }
  };

  return (
    <Form form={form} onSubmit={submit}>
      <FormError error={create.error} fallback="The walkthrough could not be saved." />
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-text-strong">Rehearse</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" value="plan" {...register('source')} className="accent-accent" /> A whole plan
          (both crew members, EVA clock)
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" value="route" {...register('source')} className="accent-accent" /> A single
          route between two nodes
        </label>
      </fieldset>
      {source === 'plan' ? (
        <Field label="Plan" error={e.planId?.message}>
          <Select
            options={[
              { value: '', label: 'Pick a plan…' },
              ...plans.map((p) => ({
                value: String(p.id),
                label: `${p.title} (${p.status}, ${p.stationName})`,
              })),
            ]}
            {...register('planId', {
              valueAsNumber: true,
              onChange: (ev) => {
                const plan = plans.find((p) => p.id === Number(ev.target.value));
                if (plan && !getValues('name')) setValue('name', `Rehearsal: ${plan.title}`);
              },
            })}
          />
        </Field>
      ) : (
        <>
          <Field label="Station" error={e.stationId?.message}>
            <Select
              options={[
                { value: '', label: 'Pick a station…' },
                ...stations.map((s) => ({ value: String(s.id), label: s.name })),
              ]}
              {...register('stationId', { valueAsNumber: true })}
            />
          </Field>
          <div className="grid grid-cols-2 gap-3">
            <Field label="From (node key)" error={e.route?.from?.message}>
              <Input autoComplete="off" placeholder="e.g. AL-1" {...register('route.from')} />
            </Field>
            <Field label="To (node key)" error={e.route?.to?.message}>
              <Input autoComplete="off" placeholder="e.g. PB3-W1" {...register('route.to')} />
            </Field>
            <Field label="Route mode" error={e.route?.mode?.message}>
              <Select
                options={ROUTE_MODES.map((m) => ({ value: m, label: MODE_LABELS[m] }))}
                {...register('route.mode')}
              />
            </Field>
            <Field
              label="Tether length (m)"
              hint="Empty: the station's default"
              error={e.route?.tetherLengthM?.message}
            >
              <Input
                type="number"
                step="0.1"
                min="0"
                {...register('route.tetherLengthM', { valueAsNumber: true })}
              />
            </Field>
          </div>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" {...register('route.carrying')} className="accent-accent" /> Carrying a
            large item
          </label>
        </>
      )}
      <Field label="Name" error={e.name?.message}>
        <Input autoComplete="off" {...register('name')} />
      </Field>
      <FormActions submit="Save walkthrough" onCancel={onCancel} isLoading={create.isPending} />
    </Form>
  );
}
