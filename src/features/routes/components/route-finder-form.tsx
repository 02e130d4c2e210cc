import { useEffect, useMemo } from 'react';
import { Controller } from 'react-hook-form';
import { ROUTE_MODES, type RouteMode } from '@shared/schemas/route';
import { toMetres, type LengthUnit } from '@shared/compute/units';
import { Button, focusRing } from '@/components/ui/button';
import { Form, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { cn } from '@/lib/cn';
import { MODE_LABELS } from '../lib/mode-comparison';
import {
  routeFormSchema,
  tetherText,
  toRouteParams,
  type PickedNode,
  type PickField,
  type RouteFormValues,
} from '../lib/route-form';
import type { RouteParams } from '../api/get-route';
import { NodePicker, type NodeOption } from './node-picker';

const MODE_HINTS: Record<RouteMode, string> = {
  fastest: 'least translation time, swaps added after',
  'fewest-swaps': 'least tether swaps, then least time',
  balanced: 'least total time, each swap counted',
};

interface RouteFinderFormProps {
  options: readonly NodeOption[];
  defaults: RouteFormValues;
  picking: PickField | null;
  onTogglePick: (field: PickField) => void;
  picked: PickedNode | null;
  onPickApplied: () => void;
  /** the mode in force, when the comparison table changed it */
  mode?: RouteMode;
  isFetching: boolean;
  onSubmit: (params: RouteParams, mode: RouteMode, unit: LengthUnit) => void;
  /** a mode change after a result applies at once: the three modes are already computed */
  onModeChange: (mode: RouteMode) => void;
}

export function RouteFinderForm({
  options,
  defaults,
  picking,
  onTogglePick,
  picked,
  onPickApplied,
  mode,
  isFetching,
  onSubmit,
  onModeChange,
}: RouteFinderFormProps) {
  const keys = useMemo(() => new Set(options.map((o) => o.key)), [options]);
  const schema = useMemo(() => routeFormSchema(keys), [keys]);
  const form = useZodForm(schema, { defaultValues: defaults });
  const {
    control,
    register,
    setValue,
    getValues,
    formState: { errors },
  } = form;

  useEffect(() => {
    if (!picked) return;
    setValue(picked.field, picked.key, { shouldValidate: true });
    onPickApplied();
  }, [picked, setValue, onPickApplied]);

  useEffect(() => {
    if (mode) setValue('mode', mode);
  }, [mode, setValue]);

  const switchUnit = (unit: LengthUnit) => {
    const { tether, unit: was } = getValues();
    const metres = toMetres(Number(tether), was);
    setValue('unit', unit);
    if (tether.trim() && Number.isFinite(metres)) setValue('tether', tetherText(metres, unit));
  };

  return (
    <Form
      form={form}
      aria-label="Route finder"
      onSubmit={(v) => {
        const { params, mode } = toRouteParams(v);
        onSubmit(params, mode, v.unit);
      }}
    >
      {(['from', 'to'] as const).map((field) => (
        <Controller
          key={field}
          control={control}
          name={field}
          render={({ field: f }) => (
            <NodePicker
              label={field === 'from' ? 'From' : 'To'}
              value={f.value}
              onChange={f.onChange}
              options={options}
              error={errors[field]?.message}
              picking={picking === field}
              onTogglePick={() => onTogglePick(field)}
            />
          )}
        />
      ))}

      <fieldset className="space-y-1.5">
        <legend className="text-sm font-medium text-text-strong">Mode</legend>
        <Controller
          control={control}
          name="mode"
          render={({ field: f }) => (
            <div className="space-y-1">
              {ROUTE_MODES.map((mode) => (
                <label key={mode} className="flex items-baseline gap-2 text-sm">
                  <input
                    type="radio"
                    name={f.name}
                    value={mode}
                    checked={f.value === mode}
                    onChange={() => {
                      f.onChange(mode);
                      onModeChange(mode);
                    }}
                    className={cn('accent-accent', focusRing)}
                  />
                  <span className="font-medium text-text-strong">{MODE_LABELS[mode]}</span>
                  <span className="text-xs text-text-muted">{MODE_HINTS[mode]}</span>
                </label>
              ))}
            </div>
          )}
        />
      </fieldset>

      <div className="space-y-1.5">
        <label htmlFor="route-tether" className="block text-sm font-medium text-text-strong">
          Tether length
        </label>
        <div className="flex gap-2">
          <Input
            id="route-tether"
            inputMode="decimal"
            autoComplete="off"
            className="min-w-0 flex-1"
            aria-invalid={errors.tether ? true : undefined}
            aria-describedby="route-tether-error"
            {...register('tether')}
          />
          <Controller
            control={control}
            name="unit"
            render={({ field: f }) => (
              <div
                role="group"
                aria-label="Tether length unit"
                className="flex shrink-0 overflow-hidden rounded-md border border-surface-line"
              >
                {(['m', 'ft'] as const).map((unit) => (
                  <button
                    key={unit}
                    type="button"
                    aria-pressed={f.value === unit}
                    onClick={() => switchUnit(unit)}
                    className={cn(
                      'h-10 px-3 text-sm font-medium',
                      focusRing,
                      f.value === unit
                        ? 'bg-accent text-white'
                        : 'bg-surface-panel text-text-strong hover:bg-surface-sunken',
                    )}
                  >
                    {unit}
                  </button>
                ))}
              </div>
            )}
          />
        </div>
        <p id="route-tether-error" aria-live="polite" className="text-sm text-danger empty:hidden">
          {errors.tether?.message}
        </p>
      </div>

      <div className="space-y-1">
        <label className="flex items-center gap-2 text-sm text-text-strong">
          <input type="checkbox" className={cn('accent-accent', focusRing)} {...register('carrying')} />
          Carrying a large item (slower translation)
        </label>
        <label className="flex items-center gap-2 text-sm text-text-strong">
          <input type="checkbox" className={cn('accent-accent', focusRing)} {...register('allowRide')} />
          Allow arm ride
        </label>
      </div>

      <Button type="submit" isLoading={isFetching}>
        Find route
      </Button>
    </Form>
  );
}
