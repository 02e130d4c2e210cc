import { z } from 'zod';
import { ArmSchema, DEFAULT_ARM, armProblems, type Arm } from '@shared/schemas/station';
import { formatLength } from '@shared/compute/units';
import { Field } from '@/components/ui/field';
import { useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { KeyedItemForm } from './keyed-item-form';

const FROM_MEMORY = 'Planning default, from memory: check against the programme’s data.';

/** What the arm form's fields hold: the minimum reach as text, so it can be left blank. */
interface ArmFormValues {
  key: string;
  label: string;
  baseNode: string;
  reachM: number;
  minReachM: string;
  tipSpeedMps: number;
  settleSeconds: number;
}

/**
 * The form's values through the station document's own arm schema, then the rules an arm has
 * against the station (its base is a node, its key is no node's and no other arm's).
 */
export function armFormSchema(others: readonly Arm[], isNode: (key: string) => boolean) {
  return z
    .object({
      key: z.string(),
      label: z.string(),
      baseNode: z.string(),
      reachM: z.number({ error: 'a number of metres' }),
      minReachM: z.string(),
      tipSpeedMps: z.number({ error: 'a number of metres per second' }),
      settleSeconds: z.number({ error: 'a number of seconds' }),
    })
    .transform(({ key, label, baseNode, reachM, minReachM, tipSpeedMps, settleSeconds }) => ({
      key: key.trim(),
      ...(label.trim() ? { label: label.trim() } : {}),
      baseNode: baseNode.trim(),
      reachM,
      // blank: no minimum reach; anything else must read as a number (the schema refuses NaN)
      ...(minReachM.trim() ? { minReachM: Number(minReachM) } : {}),
      tipSpeedMps,
      settleSeconds,
    }))
    .pipe(ArmSchema)
    .superRefine((arm, ctx) => {
      for (const p of armProblems([...others, arm], isNode)) {
        if (!p.path.startsWith(`arms[${others.length}].`)) continue;
        ctx.addIssue({ code: 'custom', path: [p.path.split('.').pop()!], message: p.message });
      }
    });
}

function defaults(arm: Arm | undefined, baseNode: string): ArmFormValues {
  return {
    key: arm?.key ?? '',
    label: arm?.label ?? '',
    baseNode: arm?.baseNode ?? baseNode,
    reachM: arm?.reachM ?? DEFAULT_ARM.reachM,
    minReachM: String(arm ? (arm.minReachM ?? '') : DEFAULT_ARM.minReachM),
    tipSpeedMps: arm?.tipSpeedMps ?? DEFAULT_ARM.tipSpeedMps,
    settleSeconds: arm?.settleSeconds ?? DEFAULT_ARM.settleSeconds,
  };
}

export interface ArmFormProps {
  /** the arm being changed; none to add one */
  arm?: Arm;
  /** the station's other arms (their keys are taken) */
  others: readonly Arm[];
  isNode: (key: string) => boolean;
  /** a new arm's base: the selected node, say */
  baseNode: string;
  isSaving: boolean;
  onSubmit: (arm: Arm) => void;
  onCancel?: () => void;
}

/** Add or change one robotic arm: its key, base node, reach shell and tip speed. */
export function ArmForm({ arm, others, isNode, baseNode, isSaving, onSubmit, onCancel }: ArmFormProps) {
  const form = useZodForm(armFormSchema(others, isNode), { defaultValues: defaults(arm, baseNode) });
  const {
    register,
    watch,
    formState: { errors },
  } = form;
  const reach = watch('reachM');
  const num = { valueAsNumber: true } as const;
  return (
    <KeyedItemForm
      form={form}
      onSubmit={onSubmit}
      noun="arm"
      itemKey={arm?.key}
      keyLabel="Arm key"
      beside={
        <Field label="Base node" error={errors.baseNode?.message} hint="the node the arm stands on">
          <Input autoComplete="off" className="font-mono" {...register('baseNode')} />
        </Field>
      }
      isSaving={isSaving}
      onCancel={onCancel}
    >
      <Field label="Arm label" error={errors.label?.message}>
        <Input autoComplete="off" {...register('label')} />
      </Field>
      <div className="grid grid-cols-2 gap-2">
        <Field
          label="Reach (m)"
          error={errors.reachM?.message}
          hint={Number.isFinite(reach) ? formatLength(reach, 'ft', 1) : undefined}
        >
          <Input type="number" step="any" inputMode="decimal" {...register('reachM', num)} />
        </Field>
        <Field label="Minimum reach (m)" error={errors.minReachM?.message} hint="blank: none">
          <Input inputMode="decimal" autoComplete="off" {...register('minReachM')} />
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-2">
        <Field label="Tip speed (m/s)" error={errors.tipSpeedMps?.message} hint={FROM_MEMORY}>
          <Input type="number" step="any" inputMode="decimal" {...register('tipSpeedMps', num)} />
        </Field>
        <Field label="Settle time (s)" error={errors.settleSeconds?.message}>
          <Input type="number" step="any" inputMode="decimal" {...register('settleSeconds', num)} />
        </Field>
      </div>
    </KeyedItemForm>
  );
}
