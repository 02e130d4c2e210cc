import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import { HAZARD_KINDS, HazardSchema, type Hazard, type Vec3 } from '@shared/schemas/station';
import { formatLength } from '@shared/compute/units';
import { Field } from '@/components/ui/field';
import { useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import type { StationEdit } from '../api/edit-station';
import { Vec3Fields } from './vec3-fields';
import { KeyedItemForm } from './keyed-item-form';

/** The form keeps both shapes' fields; only the chosen shape's reach the shared hazard schema. */
const HazardFormSchema = z
  .object({
    key: z.string(),
    kind: z.string(),
    label: z.string(),
    shape: z.enum(['sphere', 'box']),
    center: z.custom<Vec3>(),
    radiusM: z.custom<number>(),
    min: z.custom<Vec3>(),
    max: z.custom<Vec3>(),
  })
  .transform(({ key, kind, label, shape, center, radiusM, min, max }) => ({
    key,
    kind,
    shape,
    ...(label.trim() ? { label: label.trim() } : {}),
    ...(shape === 'sphere' ? { center, radiusM } : { min, max }),
  }))
  .pipe(HazardSchema);

type HazardFormValues = z.input<typeof HazardFormSchema>;

const KIND_OPTIONS = HAZARD_KINDS.map((k) => ({ value: k, label: k }));
const SHAPE_OPTIONS = [
  { value: 'sphere', label: 'sphere' },
  { value: 'box', label: 'box (axis-aligned)' },
];

function defaults(hazard: Hazard | undefined, around: Vec3): HazardFormValues {
  const [x, y, z] = around;
  const base: HazardFormValues = {
    key: hazard?.key ?? '',
    kind: hazard?.kind ?? 'keep-out',
    label: hazard?.label ?? '',
    shape: hazard?.shape ?? 'sphere',
    center: [x, y, z],
    radiusM: 1,
    min: [x - 1, y - 1, z - 1],
    max: [x + 1, y + 1, z + 1],
  };
  if (hazard?.shape === 'sphere') return { ...base, center: [...hazard.center], radiusM: hazard.radiusM };
  if (hazard?.shape === 'box') return { ...base, min: [...hazard.min], max: [...hazard.max] };
  return base;
}

interface HazardFormProps {
  hazard?: Hazard;
  existingKeys: readonly string[];
  /** where a new hazard starts: the selected node, say */
  around: Vec3;
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
  onCancel?: () => void;
}

export function HazardForm({ hazard, existingKeys, around, isSaving, onSubmit, onCancel }: HazardFormProps) {
  const form = useZodForm(HazardFormSchema, { defaultValues: defaults(hazard, around) });
  const {
    register,
    control,
    setError,
    formState: { errors },
  } = form;
  const [shape, center, radiusM, min, max] = useWatch({
    control,
    name: ['shape', 'center', 'radiusM', 'min', 'max'],
  });
  const err = errors as Record<
    string,
    { message?: string; [i: number]: { message?: string } | undefined } | undefined
  >;
  const vecErrors = (name: string) => [0, 1, 2].map((i) => err[name]?.[i]?.message ?? err[name]?.message);
  const vec = (name: 'center' | 'min' | 'max') =>
    [0, 1, 2].map((i) => register(`${name}.${i as 0 | 1 | 2}`, { valueAsNumber: true })) as never;

  const submit = (h: Hazard) => {
    if (!hazard) {
      if (existingKeys.includes(h.key)) {
        setError('key', { message: `${h.key} is already used on this station` });
        return;
      }
      onSubmit({ type: 'create-hazard', hazard: h });
      return;
    }
    const { key: _key, label, ...rest } = h;
    onSubmit({ type: 'update-hazard', key: hazard.key, hazard: { ...rest, label: label ?? null } });
  };

  return (
    <KeyedItemForm
      form={form}
      onSubmit={submit}
      noun="hazard"
      itemKey={hazard?.key}
      keyLabel="Key"
      beside={
        <Field label="Kind" error={errors.kind?.message} hint="keep-out blocks routes; caution warns">
          <Select options={KIND_OPTIONS} {...register('kind')} />
        </Field>
      }
      isSaving={isSaving}
      onCancel={onCancel}
    >
      <div className="grid grid-cols-2 gap-2">
        <Field label="Label" error={errors.label?.message}>
          <Input autoComplete="off" {...register('label')} />
        </Field>
        <Field label="Shape" error={errors.shape?.message}>
          <Select options={SHAPE_OPTIONS} {...register('shape')} />
        </Field>
      </div>
      {shape === 'sphere' ? (
        <>
          <Vec3Fields legend="Centre" values={center} errors={vecErrors('center')} fields={vec('center')} />
          <Field
            label="Radius (m)"
            error={err.radiusM?.message}
            hint={Number.isFinite(radiusM) ? formatLength(radiusM, 'ft', 2) : undefined}
          >
            <Input
              type="number"
              step="any"
              inputMode="decimal"
              {...register('radiusM', { valueAsNumber: true })}
            />
          </Field>
        </>
      ) : (
        <>
          <Vec3Fields legend="Minimum corner" values={min} errors={vecErrors('min')} fields={vec('min')} />
          <Vec3Fields legend="Maximum corner" values={max} errors={vecErrors('max')} fields={vec('max')} />
        </>
      )}
    </KeyedItemForm>
  );
}
