import { useMemo } from 'react';
import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import { OrbitSettingsSchema, StationSettingsSchema, type StationSettings } from '@shared/schemas/station';
import type { StationSummary } from '@shared/schemas/station-edits';
import { formatLength, parseLength } from '@shared/compute/units';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import type { StationEdit } from '../api/edit-station';

const FROM_MEMORY = 'Planning default, from memory: check against the programme’s data.';

interface SettingsFormValues {
  name: string;
  tether: string;
  settings: {
    speedsMps: { handrail: number; hop: number; ride: number };
    hopSeconds: number;
    swapSeconds: number;
    carryFactor: number;
    reach: { standOffM: number; radiusM: number };
  };
  orbit: { altitudeKm: number; betaDeg: number };
}

const SettingsOutputSchema = z.object({
  name: z.string().trim().min(1, 'a station needs a name').max(200),
  orbit: OrbitSettingsSchema,
  settings: StationSettingsSchema,
});

/** The form's tether text becomes metres; the rest goes through the station document's own schemas. */
function settingsFormSchema(current: StationSettings) {
  return z
    .object({
      name: z.string(),
      tether: z.string(),
      // checked after the transform, by the station document's schemas
      settings: z.custom<SettingsFormValues['settings']>(),
      orbit: z.custom<SettingsFormValues['orbit']>(),
    })
    .superRefine((v, ctx) => {
      const parsed = parseLength(v.tether);
      if (!parsed.ok) ctx.addIssue({ code: 'custom', path: ['tether'], message: parsed.message });
    })
    .transform((v): z.input<typeof SettingsOutputSchema> => {
      const parsed = parseLength(v.tether);
      return {
        name: v.name,
        orbit: v.orbit,
        settings: {
          ...v.settings,
          tetherLengthM: parsed.ok ? parsed.value : NaN,
          reach: { ...current.reach, ...v.settings.reach },
        },
      };
    })
    .pipe(SettingsOutputSchema);
}

interface SettingsFormProps {
  station: Pick<StationSummary, 'name' | 'orbit' | 'settings'>;
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
}

export function SettingsForm({ station, isSaving, onSubmit }: SettingsFormProps) {
  const { settings, orbit } = station;
  const schema = useMemo(() => settingsFormSchema(settings), [settings]);
  const form = useZodForm(schema, {
    defaultValues: {
      name: station.name,
      tether: String(settings.tetherLengthM),
      settings: {
        speedsMps: { ...settings.speedsMps },
        hopSeconds: settings.hopSeconds,
        swapSeconds: settings.swapSeconds,
        carryFactor: settings.carryFactor,
        reach: { standOffM: settings.reach.standOffM, radiusM: settings.reach.radiusM },
      },
      orbit: { ...orbit },
    },
  });
  const {
    register,
    control,
    formState: { errors, isDirty },
  } = form;
  const [tetherText, reach] = useWatch({ control, name: ['tether', 'settings.reach'] });
  const tether = parseLength(tetherText ?? '');
  const e = errors.settings;
  const num = { valueAsNumber: true } as const;
  const numberInput = {
    type: 'number',
    step: 'any',
    inputMode: 'decimal' as const,
    className: 'tabular-nums',
  };

  return (
    <Form
      form={form}
      aria-label="Station settings"
      onSubmit={(v) => onSubmit({ type: 'update-station', changes: v })}
    >
      <Field label="Station name" error={errors.name?.message}>
        <Input autoComplete="off" {...register('name')} />
      </Field>
      <Field
        label="Default tether length (m, or type ft)"
        error={errors.tether?.message}
        hint={
          <>
            {tether.ok
              ? `${formatLength(tether.value, 'm', 2)} = ${formatLength(tether.value, 'ft', 1)}. `
              : ''}
            85 ft (25.9 m) is the commonly reported station safety tether (press reports).
          </>
        }
      >
        <Input autoComplete="off" {...register('tether')} />
      </Field>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-text-strong">Translation</legend>
        <p className="text-xs text-text-muted">{FROM_MEMORY}</p>
        <div className="grid grid-cols-3 gap-2">
          <Field label="Handrail m/s" error={e?.speedsMps?.handrail?.message}>
            <Input {...numberInput} {...register('settings.speedsMps.handrail', num)} />
          </Field>
          <Field label="Hop m/s" error={e?.speedsMps?.hop?.message}>
            <Input {...numberInput} {...register('settings.speedsMps.hop', num)} />
          </Field>
          <Field label="Arm ride m/s" error={e?.speedsMps?.ride?.message}>
            <Input {...numberInput} {...register('settings.speedsMps.ride', num)} />
          </Field>
          <Field label="Hop extra s" error={e?.hopSeconds?.message}>
            <Input {...numberInput} {...register('settings.hopSeconds', num)} />
          </Field>
          <Field label="Tether swap s" error={e?.swapSeconds?.message}>
            <Input {...numberInput} {...register('settings.swapSeconds', num)} />
          </Field>
          <Field label="Carry factor ×" error={e?.carryFactor?.message}>
            <Input {...numberInput} {...register('settings.carryFactor', num)} />
          </Field>
        </div>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-text-strong">Foot-restraint reach</legend>
        <p className="text-xs text-text-muted">{FROM_MEMORY}</p>
        <div className="grid grid-cols-2 gap-2">
          <Field
            label="Stand-off (m)"
            error={e?.reach?.standOffM?.message}
            hint={Number.isFinite(reach?.standOffM) ? formatLength(reach.standOffM, 'ft', 2) : undefined}
          >
            <Input {...numberInput} {...register('settings.reach.standOffM', num)} />
          </Field>
          <Field
            label="Reach radius (m)"
            error={e?.reach?.radiusM?.message}
            hint={Number.isFinite(reach?.radiusM) ? formatLength(reach.radiusM, 'ft', 2) : undefined}
          >
            <Input {...numberInput} {...register('settings.reach.radiusM', num)} />
          </Field>
        </div>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-text-strong">Orbit</legend>
        <div className="grid grid-cols-2 gap-2">
          <Field label="Altitude (km)" error={errors.orbit?.altitudeKm?.message}>
            <Input {...numberInput} {...register('orbit.altitudeKm', num)} />
          </Field>
          <Field label="Beta angle (°)" error={errors.orbit?.betaDeg?.message}>
            <Input {...numberInput} {...register('orbit.betaDeg', num)} />
          </Field>
        </div>
      </fieldset>
      <FormActions submit="Save settings" isLoading={isSaving} disabled={!isDirty} />
    </Form>
  );
}
