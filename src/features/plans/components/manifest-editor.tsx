import { useId, useState } from 'react';
import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import {
  AIRLOCK_LOCATION,
  CrewMemberSchema,
  ManifestItemSchema,
  ManifestKindSchema,
  planReferenceProblems,
  type ManifestItem,
  type ManifestKind,
} from '@shared/schemas/plan';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Table, Td, Th } from '@/components/ui/table';
import { numberText } from '../lib/form-fields';
import { uniqueItemKey } from '../lib/task-form-schema';

export const itemRowId = (index: number) => `plan-item-${index + 1}`;

const blankToUndefined = <T extends z.ZodType>(schema: T) =>
  z.union([z.literal('').transform(() => undefined), schema]);

const ItemFieldsSchema = z.object({
  name: ManifestItemSchema.shape.name,
  kind: ManifestKindSchema,
  quantity: numberText(ManifestItemSchema.shape.quantity.unwrap()),
  carriedBy: blankToUndefined(CrewMemberSchema),
  startsAt: ManifestItemSchema.shape.startsAt.unwrap(),
  installedAt: blankToUndefined(ManifestItemSchema.shape.installedAt.unwrap()),
  leaveOutside: z.boolean(),
});

/**
 * The item's fields, then the manifest's own rules (`planReferenceProblems`, as the server checks
 * them) for this item among the others, on the field each concerns.
 */
function itemFormSchema(others: readonly ManifestItem[], key: string | undefined) {
  return ItemFieldsSchema.superRefine((v, ctx) => {
    const item = { ...v, key: key ?? uniqueItemKey(v.name, others), leaveOutside: v.leaveOutside };
    for (const p of planReferenceProblems([], [...others, item])) {
      if (p.path[0] === 'manifest' && p.path[1] === others.length) {
        ctx.addIssue({ code: 'custom', path: p.path.slice(2), message: p.message });
      }
    }
  });
}

export const KIND_NAMES: Record<ManifestKind, string> = {
  tool: 'Tool',
  bag: 'Bag',
  'foot-restraint': 'Foot restraint (portable)',
  'tether-anchor': 'Tether anchor (portable)',
  'handling-aid': 'Handling aid',
  'large-item': 'Large item',
  other: 'Other',
};

interface ItemFormProps {
  item?: ManifestItem;
  /** the rest of the manifest: keys are unique among them */
  others: readonly ManifestItem[];
  /** node keys offered as places an item starts or ends at */
  places: string[];
  onSubmit: (item: ManifestItem) => void;
  onCancel: () => void;
}

function ItemForm({ item, others, places, onSubmit, onCancel }: ItemFormProps) {
  const listId = useId();
  const [schema] = useState(() => itemFormSchema(others, item?.key));
  const form = useZodForm(schema, {
    defaultValues: {
      name: item?.name ?? '',
      kind: item?.kind ?? 'tool',
      quantity: String(item?.quantity ?? 1),
      carriedBy: item ? (item.carriedBy ?? '') : 'EV1',
      startsAt: item?.startsAt ?? AIRLOCK_LOCATION,
      installedAt: item?.installedAt ?? '',
      leaveOutside: item?.leaveOutside ?? false,
    },
  });
  const {
    register,
    control,
    formState: { errors },
  } = form;
  const name = useWatch({ control, name: 'name' });
  // a new item is keyed from its name now, so task actions can name it before the plan is saved
  const key = item?.key ?? (name.trim() ? uniqueItemKey(name, others) : undefined);
  return (
    <Form
      form={form}
      onSubmit={(v) =>
        onSubmit({
          ...(item?.id === undefined ? {} : { id: item.id }),
          key: item?.key ?? uniqueItemKey(v.name, others),
          ...(item?.notes ? { notes: item.notes } : {}),
          name: v.name,
          kind: v.kind,
          quantity: v.quantity,
          ...(v.carriedBy ? { carriedBy: v.carriedBy } : {}),
          startsAt: v.startsAt,
          ...(v.installedAt ? { installedAt: v.installedAt } : {}),
          leaveOutside: v.leaveOutside,
        })
      }
    >
      <datalist id={listId}>
        {[AIRLOCK_LOCATION, ...places].map((p) => (
          <option key={p} value={p} />
        ))}
      </datalist>
      <Field
        label="Name"
        error={errors.name?.message}
        hint={
          key ? (
            <>
              Key <span className="font-mono">{key}</span>
              {item?.key ? '' : ' (from the name)'}: tasks name the item by it
            </>
          ) : undefined
        }
      >
        <Input autoComplete="off" {...register('name')} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Kind" error={errors.kind?.message}>
          <Select
            options={Object.entries(KIND_NAMES).map(([value, label]) => ({ value, label }))}
            {...register('kind')}
          />
        </Field>
        <Field label="Quantity" error={errors.quantity?.message}>
          <Input inputMode="numeric" {...register('quantity')} />
        </Field>
        <Field label="Carried out by" error={errors.carriedBy?.message}>
          <Select
            options={[
              { value: 'EV1', label: 'EV1' },
              { value: 'EV2', label: 'EV2' },
              { value: '', label: 'Nobody (stays where it starts)' },
            ]}
            {...register('carriedBy')}
          />
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Starts at" error={errors.startsAt?.message} hint="airlock or a node key">
          <Input list={listId} autoComplete="off" {...register('startsAt')} />
        </Field>
        <Field
          label="Installed at"
          error={errors.installedAt?.message}
          hint="A restraint's socket or an anchor's node, when it starts installed"
        >
          <Input list={listId} autoComplete="off" {...register('installedAt')} />
        </Field>
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register('leaveOutside')} />
        Stays outside at the end of the day (staged for a later EVA)
      </label>
      <FormActions submit={item ? 'Apply changes' : 'Add item'} onCancel={onCancel} />
    </Form>
  );
}

interface ManifestEditorProps {
  manifest: ManifestItem[];
  onChange: (manifest: ManifestItem[]) => void;
  readOnly: boolean;
  places: string[];
}

export function ManifestEditor({ manifest, onChange, readOnly, places }: ManifestEditorProps) {
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const save = (item: ManifestItem) => {
    onChange(editing === 'new' ? [...manifest, item] : manifest.map((m, i) => (i === editing ? item : m)));
    setEditing(null);
  };
  return (
    <div className="space-y-3">
      {manifest.length === 0 ? (
        <EmptyState>Nothing on the manifest yet.</EmptyState>
      ) : (
        <Table caption="Manifest">
          <thead>
            <tr>
              <Th>#</Th>
              <Th>Name</Th>
              <Th>Key</Th>
              <Th>Kind</Th>
              <Th>Qty</Th>
              <Th>Carried by</Th>
              <Th>Starts</Th>
              <Th>End of day</Th>
              {!readOnly && <Th className="text-right">Actions</Th>}
            </tr>
          </thead>
          <tbody>
            {manifest.map((m, i) => (
              <tr key={`${m.id ?? 'new'}-${i}`} id={itemRowId(i)} tabIndex={-1}>
                <Td className="text-text-muted">{i + 1}</Td>
                <Td className="font-medium text-text-strong">{m.name}</Td>
                <Td className="font-mono text-xs whitespace-nowrap">{m.key ?? '(new)'}</Td>
                <Td>{KIND_NAMES[m.kind]}</Td>
                <Td>{m.quantity}</Td>
                <Td>{m.carriedBy ?? '—'}</Td>
                <Td>{m.installedAt ? `installed at ${m.installedAt}` : m.startsAt}</Td>
                <Td>{m.leaveOutside ? 'stays outside' : 'back inside'}</Td>
                {!readOnly && (
                  <Td className="text-right whitespace-nowrap">
                    <Button
                      size="sm"
                      variant="secondary"
                      onClick={() => setEditing(i)}
                      aria-label={`Edit ${m.name}`}
                    >
                      Edit
                    </Button>{' '}
                    <Button
                      size="sm"
                      variant="ghost"
                      className="text-danger"
                      aria-label={`Remove ${m.name}`}
                      onClick={() => onChange(manifest.filter((_, k) => k !== i))}
                    >
                      Remove
                    </Button>
                  </Td>
                )}
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      {!readOnly && (
        <Button variant="secondary" onClick={() => setEditing('new')}>
          Add an item
        </Button>
      )}
      <Dialog
        open={editing !== null}
        title={editing === 'new' ? 'Add to the manifest' : 'Edit manifest item'}
        onClose={() => setEditing(null)}
      >
        <ItemForm
          item={typeof editing === 'number' ? manifest[editing] : undefined}
          others={manifest.filter((_, i) => i !== editing)}
          places={places}
          onSubmit={save}
          onCancel={() => setEditing(null)}
        />
      </Dialog>
    </div>
  );
}
