import { useWatch, type Control } from 'react-hook-form';
import { z } from 'zod';
import { phaseOfOrbitStart } from '@shared/compute/orbit';
import { parseLength, formatLength, metresToFeet } from '@shared/compute/units';
import {
  CrewSlotSchema,
  DEFAULT_EGRESS_SECONDS,
  DEFAULT_INGRESS_SECONDS,
  DEFAULT_TIME_LIMIT_SECONDS,
  type CreatePlanInput,
} from '@shared/schemas/plan';
import { ROUTE_MODES } from '@shared/schemas/route';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { useCreatePlan } from '../api/create-plan';
import {
  durationField,
  lengthText,
  optionalBetaText,
  orbitStartFields,
  orbitStartOf,
  planField,
  planOrbitArcs,
} from '../lib/form-fields';
import { durationText } from '../lib/plan-draft';
import type { PlanView, StationChoice } from '../types';
import { OrbitStartControls, orbitStartHint } from './orbit-start-field';
import { ROUTE_MODE_LABELS } from './route-mode-labels';

const CreatePlanFormSchema = z.object({
  title: planField.title,
  stationId: z.string().min(1, 'pick a station').transform(Number),
  date: planField.date,
  ev1Name: CrewSlotSchema.shape.name,
  ev1Tether: lengthText(CrewSlotSchema.shape.tetherLengthM.unwrap()),
  ev2Name: CrewSlotSchema.shape.name,
  ev2Tether: lengthText(CrewSlotSchema.shape.tetherLengthM.unwrap()),
  routeMode: planField.routeMode,
  allowRide: z.boolean(),
  startMinutes: orbitStartFields.minutes,
  startSide: orbitStartFields.side,
  startEvent: orbitStartFields.event,
  betaDegOverride: optionalBetaText,
  timeLimit: durationField(planField.timeLimitSeconds),
  egress: durationField(planField.egressSeconds),
  ingress: durationField(planField.ingressSeconds),
});
type FormInput = z.input<typeof CreatePlanFormSchema>;
type FormOutput = z.output<typeof CreatePlanFormSchema>;

const toCreateInput = (v: FormOutput, station: StationChoice): CreatePlanInput => ({
  title: v.title,
  stationId: v.stationId,
  date: v.date,
  crew: {
    EV1: { name: v.ev1Name, tetherLengthM: v.ev1Tether },
    EV2: { name: v.ev2Name, tetherLengthM: v.ev2Tether },
  },
  routeMode: v.routeMode,
  allowRide: v.allowRide,
  orbitPhaseAtStartDeg: phaseOfOrbitStart(
    orbitStartOf(v.startMinutes, v.startSide, v.startEvent),
    planOrbitArcs(station.orbit, v.betaDegOverride),
  ),
  ...(v.betaDegOverride === undefined ? {} : { betaDegOverride: v.betaDegOverride }),
  timeLimitSeconds: v.timeLimit,
  egressSeconds: v.egress,
  ingressSeconds: v.ingress,
  tasks: [],
  manifest: [],
});

/** "= 85.0 ft" beside a tether typed in metres (and the other way round), so both units are in view. */
function TetherEcho({
  control,
  name,
}: {
  control: Control<FormInput, unknown, FormOutput>;
  name: 'ev1Tether' | 'ev2Tether';
}) {
  const text = useWatch({ control, name });
  const parsed = parseLength(text ?? '', 'm');
  if (!parsed.ok) return <>m or ft, e.g. 25.9 m or 85 ft</>;
  return (
    <>
      = {formatLength(parsed.value, 'm')} = {metresToFeet(parsed.value).toFixed(1)} ft
    </>
  );
}

/** What the start typed means on the chosen station's orbit: the arc it falls in and the phase. */
function StartEcho({
  control,
  stations,
}: {
  control: Control<FormInput, unknown, FormOutput>;
  stations: StationChoice[];
}) {
  const [stationId, minutes, side, event, beta] = useWatch({
    control,
    name: ['stationId', 'startMinutes', 'startSide', 'startEvent', 'betaDegOverride'],
  });
  const station = stations.find((s) => String(s.id) === stationId);
  const m = orbitStartFields.minutes.safeParse(minutes ?? '');
  const b = optionalBetaText.safeParse(beta ?? '');
  if (!station || !m.success || !b.success) return null;
  const arcs = planOrbitArcs(station.orbit, b.data);
  return <>{orbitStartHint(phaseOfOrbitStart(orbitStartOf(m.data, side, event), arcs), arcs)}</>;
}

interface CreatePlanFormProps {
  stations: StationChoice[];
  onSuccess: (plan: PlanView) => void;
  onCancel: () => void;
}

export function CreatePlanForm({ stations, onSuccess, onCancel }: CreatePlanFormProps) {
  const create = useCreatePlan({ onSuccess });
  const first = stations[0];
  const tether = first ? formatLength(first.tetherLengthM) : '';
  const form = useZodForm(CreatePlanFormSchema, {
    defaultValues: {
      title: '',
      stationId: first ? String(first.id) : '',
      date: new Date().toISOString().slice(0, 10),
      ev1Name: '',
      ev1Tether: tether,
      ev2Name: '',
      ev2Tether: tether,
      routeMode: 'balanced',
      allowRide: false,
      startMinutes: '0',
      startSide: 'after',
      startEvent: 'sunrise',
      betaDegOverride: '',
      timeLimit: durationText(DEFAULT_TIME_LIMIT_SECONDS),
      egress: durationText(DEFAULT_EGRESS_SECONDS),
      ingress: durationText(DEFAULT_INGRESS_SECONDS),
    },
  });
  const {
    register,
    control,
    setValue,
    formState: { errors },
  } = form;
  const stationField = register('stationId');

  return (
    <Form
      form={form}
      onSubmit={(v) => {
        const station = stations.find((s) => s.id === v.stationId);
        if (station) create.mutate(toCreateInput(v, station));
      }}
    >
      <FormError error={create.error} fallback="The plan could not be created." />
      <Field label="Title" error={errors.title?.message}>
        <Input autoComplete="off" {...register('title')} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Station" error={errors.stationId?.message}>
          <Select
            options={stations.map((s) => ({ value: String(s.id), label: s.name }))}
            {...stationField}
            onChange={(e) => {
              void stationField.onChange(e);
              const station = stations.find((s) => String(s.id) === e.target.value);
              if (station) {
                setValue('ev1Tether', formatLength(station.tetherLengthM));
                setValue('ev2Tether', formatLength(station.tetherLengthM));
              }
            }}
          />
        </Field>
        <Field label="EVA date" error={errors.date?.message}>
          <Input type="date" {...register('date')} />
        </Field>
      </div>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-text-strong">Crew</legend>
        <Field label="EV1 name" error={errors.ev1Name?.message}>
          <Input autoComplete="off" {...register('ev1Name')} />
        </Field>
        <Field
          label="EV1 tether length"
          error={errors.ev1Tether?.message}
          hint={<TetherEcho control={control} name="ev1Tether" />}
        >
          <Input autoComplete="off" {...register('ev1Tether')} />
        </Field>
        <Field label="EV2 name" error={errors.ev2Name?.message}>
          <Input autoComplete="off" {...register('ev2Name')} />
        </Field>
        <Field
          label="EV2 tether length"
          error={errors.ev2Tether?.message}
          hint={<TetherEcho control={control} name="ev2Tether" />}
        >
          <Input autoComplete="off" {...register('ev2Tether')} />
        </Field>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Route mode" error={errors.routeMode?.message}>
          <Select
            options={ROUTE_MODES.map((m) => ({ value: m, label: ROUTE_MODE_LABELS[m] }))}
            {...register('routeMode')}
          />
        </Field>
        <label className="flex items-center gap-2 self-end pb-2 text-sm font-medium text-text-strong">
          <input type="checkbox" className="size-4 accent-accent" {...register('allowRide')} />
          Arm ride allowed
        </label>
        <OrbitStartControls
          minutes={register('startMinutes')}
          side={register('startSide')}
          event={register('startEvent')}
          hint={<StartEcho control={control} stations={stations} />}
          error={errors.startMinutes?.message}
        />
        <Field
          label="Beta angle override (°)"
          error={errors.betaDegOverride?.message}
          hint="Leave blank for the station's beta angle"
        >
          <Input inputMode="decimal" {...register('betaDegOverride')} />
        </Field>
        <Field label="Time limit (h:mm)" error={errors.timeLimit?.message}>
          <Input {...register('timeLimit')} />
        </Field>
        <div className="grid grid-cols-2 gap-4">
          <Field label="Egress (h:mm)" error={errors.egress?.message}>
            <Input {...register('egress')} />
          </Field>
          <Field label="Ingress (h:mm)" error={errors.ingress?.message}>
            <Input {...register('ingress')} />
          </Field>
        </div>
      </div>
      <FormActions submit="Create plan" onCancel={onCancel} isLoading={create.isPending} />
    </Form>
  );
}
