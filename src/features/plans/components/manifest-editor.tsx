import { useId, useState } from 'react';
import { z } from 'zod';
import {
  AIRLOCK_LOCATION,
  CrewMemberSchema,
  ManifestItemSchema,
  ManifestKindSchema,
  type ManifestItem,
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

export const itemRowId = (index: number) => `plan-item-${index + 1}`;

const ItemFormSchema = z.object({
  name: ManifestItemSchema.shape.name,
  kind: ManifestKindSchema,
  quantity: numberText(ManifestItemSchema.shape.quantity.unwrap()),
  carriedBy: CrewMemberSchema,
  startsAt: ManifestItemSchema.shape.startsAt.unwrap(),
  endsAt: z.union([z.literal('').transform(() => undefined), ManifestItemSchema.shape.endsAt.unwrap()]),
});

interface ItemFormProps {
  item?: ManifestItem;
  /** node keys offered as places an item starts or ends at */
  places: string[];
  onSubmit: (item: ManifestItem) => void;
  onCancel: () => void;
}

function ItemForm({ item, places, onSubmit, onCancel }: ItemFormProps) {
  const listId = useId();
  const form = useZodForm(ItemFormSchema, {
    defaultValues: {
      name: item?.name ?? '',
      kind: item?.kind ?? 'tool',
      quantity: String(item?.quantity ?? 1),
      carriedBy: item?.carriedBy ?? 'EV1',
      startsAt: item?.startsAt ?? AIRLOCK_LOCATION,
      endsAt: item ? (item.endsAt ?? '') : AIRLOCK_LOCATION,
    },
  });
  const {
    register,
    formState: { errors },
  } = form;
  return (
    <Form
      form={form}
      onSubmit={(v) =>
        onSubmit({
          ...(item?.id === undefined ? {} : { id: item.id }),
          ...(item?.notes ? { notes: item.notes } : {}),
          name: v.name,
          kind: v.kind,
          quantity: v.quantity,
          carriedBy: v.carriedBy,
          startsAt: v.startsAt,
          ...(v.endsAt ? { endsAt: v.endsAt } : {}),
        })
      }
    >
      <datalist id={listId}>
        {[AIRLOCK_LOCATION, ...places].map((p) => (
          <option key={p} value={p} />
        ))}
      </datalist>
      <Field label="Name" error={errors.name?.message}>
        <Input autoComplete="off" {...register('name')} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Kind" error={errors.kind?.message}>
          <Select
            options={[
              { value: 'tool', label: 'Tool' },
              { value: 'bag', label: 'Bag' },
            ]}
            {...register('kind')}
          />
        </Field>
        <Field label="Quantity" error={errors.quantity?.message}>
          <Input inputMode="numeric" {...register('quantity')} />
        </Field>
        <Field label="Carried by" error={errors.carriedBy?.message}>
          <Select
            options={[
              { value: 'EV1', label: 'EV1' },
              { value: 'EV2', label: 'EV2' },
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
          label="Ends at"
          error={errors.endsAt?.message}
          hint="Blank: not yet decided (the inventory check warns)"
        >
          <Input list={listId} autoComplete="off" {...register('endsAt')} />
        </Field>
      </div>
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
        <EmptyState>No tools or bags on the manifest.</EmptyState>
      ) : (
        <Table caption="Manifest">
          <thead>
            <tr>
              <Th>#</Th>
              <Th>Name</Th>
              <Th>Tool / bag</Th>
              <Th>Qty</Th>
              <Th>Carried by</Th>
              <Th>Starts at</Th>
              <Th>Ends at</Th>
              {!readOnly && <Th className="text-right">Actions</Th>}
            </tr>
          </thead>
          <tbody>
            {manifest.map((m, i) => (
              <tr key={`${m.id ?? 'new'}-${i}`} id={itemRowId(i)} tabIndex={-1}>
                <Td className="text-text-muted">{i + 1}</Td>
                <Td className="font-medium text-text-strong">{m.name}</Td>
                <Td>{m.kind === 'bag' ? 'Bag' : 'Tool'}</Td>
                <Td>{m.quantity}</Td>
                <Td>{m.carriedBy}</Td>
                <Td>{m.startsAt}</Td>
                <Td>{m.endsAt ?? <span className="text-caution">⚠ not set</span>}</Td>
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
          Add tool or bag
        </Button>
      )}
      <Dialog
        open={editing !== null}
        title={editing === 'new' ? 'Add to the manifest' : 'Edit manifest item'}
        onClose={() => setEditing(null)}
      >
        <ItemForm
          item={typeof editing === 'number' ? manifest[editing] : undefined}
          places={places}
          onSubmit={save}
          onCancel={() => setEditing(null)}
        />
      </Dialog>
    </div>
  );
}
