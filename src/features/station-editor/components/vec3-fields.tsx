import type { UseFormRegisterReturn } from 'react-hook-form';
import { formatLength } from '@shared/compute/units';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';

const AXES = ['x', 'y', 'z'] as const;
export const NUDGE_M = 0.1;

interface Vec3FieldsProps {
  legend: string;
  fields: readonly [UseFormRegisterReturn, UseFormRegisterReturn, UseFormRegisterReturn];
  values: readonly unknown[];
  errors?: readonly (string | undefined)[];
  /** lengths get a feet hint; a direction does not */
  lengths?: boolean;
  onNudge?: (axis: 0 | 1 | 2, deltaM: number) => void;
}

export function Vec3Fields({
  legend,
  fields,
  values,
  errors = [],
  lengths = true,
  onNudge,
}: Vec3FieldsProps) {
  return (
    <fieldset className="space-y-1">
      <legend className="text-sm font-semibold text-text-strong">{legend}</legend>
      <div className="grid grid-cols-3 gap-2">
        {AXES.map((axis, i) => {
          const value = Number(values[i]);
          return (
            <div key={axis} className="space-y-1">
              <Field
                label={lengths ? `${axis} (m)` : axis}
                error={errors[i]}
                hint={lengths && Number.isFinite(value) ? formatLength(value, 'ft', 2) : undefined}
              >
                <Input type="number" step="any" inputMode="decimal" className="tabular-nums" {...fields[i]} />
              </Field>
              {onNudge && (
                <div className="flex gap-1">
                  <Button
                    size="sm"
                    variant="secondary"
                    className="h-7! min-w-0 flex-1 px-0! text-xs!"
                    aria-label={`${axis} minus ${NUDGE_M} m`}
                    onClick={() => onNudge(i as 0 | 1 | 2, -NUDGE_M)}
                  >
                    −{NUDGE_M}
                  </Button>
                  <Button
                    size="sm"
                    variant="secondary"
                    className="h-7! min-w-0 flex-1 px-0! text-xs!"
                    aria-label={`${axis} plus ${NUDGE_M} m`}
                    onClick={() => onNudge(i as 0 | 1 | 2, NUDGE_M)}
                  >
                    +{NUDGE_M}
                  </Button>
                </div>
              )}
            </div>
          );
        })}
      </div>
    </fieldset>
  );
}
