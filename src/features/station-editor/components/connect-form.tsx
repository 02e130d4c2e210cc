import { useEffect, useId, useRef, useState } from 'react';
import { z } from 'zod';
import { EDGE_KINDS, EdgeKindSchema, KeySchema } from '@shared/schemas/station';
import { parseLength } from '@shared/compute/units';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import type { StationEdit } from '../api/edit-station';
import type { EditableGraph } from '../utils/types';

const ConnectFormSchema = z
  .object({
    from: KeySchema,
    to: KeySchema,
    kind: EdgeKindSchema,
    length: z.string(),
  })
  .superRefine((v, ctx) => {
    if (v.from === v.to) ctx.addIssue({ code: 'custom', path: ['to'], message: 'pick a different node' });
    if (v.length.trim()) {
      const parsed = parseLength(v.length);
      if (!parsed.ok) ctx.addIssue({ code: 'custom', path: ['length'], message: parsed.message });
    }
  });

const EDGE_KIND_OPTIONS = EDGE_KINDS.map((k) => ({ value: k, label: k }));

interface ConnectFormProps {
  graph: EditableGraph;
  selectedKey: string | null;
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
}

/** Connects two nodes; the second can be typed or picked in 3D (the next node selected). */
export function ConnectForm({ graph, selectedKey, isSaving, onSubmit }: ConnectFormProps) {
  const listId = useId();
  const [picking, setPicking] = useState(false);
  const pickingRef = useRef(false);
  const form = useZodForm(ConnectFormSchema, {
    defaultValues: { from: selectedKey ?? '', to: '', kind: 'handrail', length: '' },
  });
  const {
    register,
    setValue,
    setError,
    formState: { errors },
  } = form;

  useEffect(() => {
    if (!selectedKey) return;
    if (pickingRef.current) {
      setValue('to', selectedKey, { shouldValidate: true });
      pickingRef.current = false;
      setPicking(false);
    } else setValue('from', selectedKey);
  }, [selectedKey, setValue]);

  const known = new Set(graph.nodes.map((n) => n.key));
  const submit = (v: z.output<typeof ConnectFormSchema>) => {
    let bad = false;
    for (const end of ['from', 'to'] as const) {
      if (!known.has(v[end])) {
        setError(end, { message: `no node ${v[end]} on this station` });
        bad = true;
      }
    }
    if (bad) return;
    const length = v.length.trim() ? parseLength(v.length) : null;
    onSubmit({
      type: 'create-edge',
      edge: { from: v.from, to: v.to, kind: v.kind, ...(length?.ok ? { lengthM: length.value } : {}) },
    });
    // sent: the fields stay for the next edge, no longer edits waiting to be saved
    form.reset(form.getValues());
  };

  return (
    <Form form={form} onSubmit={submit} className="space-y-3" aria-label="Connect nodes">
      <datalist id={listId}>
        {graph.nodes.map((n) => (
          <option key={n.key} value={n.key} />
        ))}
      </datalist>
      <div className="grid grid-cols-2 gap-2">
        <Field label="From" error={errors.from?.message}>
          <Input list={listId} autoComplete="off" className="font-mono" {...register('from')} />
        </Field>
        <Field label="To" error={errors.to?.message}>
          <Input list={listId} autoComplete="off" className="font-mono" {...register('to')} />
        </Field>
      </div>
      <Button
        size="sm"
        variant={picking ? 'primary' : 'secondary'}
        aria-pressed={picking}
        onClick={() => {
          pickingRef.current = !picking;
          setPicking(!picking);
        }}
      >
        {picking ? 'Select the second node in 3D or the list… (cancel)' : 'Pick “To” in 3D'}
      </Button>
      <div className="grid grid-cols-2 gap-2">
        <Field label="Kind" error={errors.kind?.message}>
          <Select options={EDGE_KIND_OPTIONS} {...register('kind')} />
        </Field>
        <Field
          label="Length (optional)"
          error={errors.length?.message}
          hint="Blank: from the positions. 3.2 m or 10.5 ft"
        >
          <Input autoComplete="off" {...register('length')} />
        </Field>
      </div>
      <FormActions submit="Connect" isLoading={isSaving} />
    </Form>
  );
}
