import { useEffect, useLayoutEffect, useRef, useState } from 'react';
import { useWatch } from 'react-hook-form';
import { z } from 'zod';
import { nearestFacePoint } from '@shared/compute/truss-faces';
import {
  KeySchema,
  NODE_KINDS,
  NodeKindSchema,
  NodeSchema,
  Vec3Schema,
  type NodeKind,
  type StationNode,
  type Vec3,
} from '@shared/schemas/station';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input, controlClass } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { cn } from '@/lib/cn';
import type { StationEdit } from '../api/edit-station';
import type { NodeChangesSchema } from '@shared/schemas/station-edits';
import { keyPrefix, normalise, suggestNodeKey } from '../utils/node-keys';
import type { EditableGraph, SurfacePick } from '../utils/types';
import { Vec3Fields } from './vec3-fields';

type NodeChanges = z.infer<typeof NodeChangesSchema>;

const NodeFormSchema = z
  .object({
    key: KeySchema,
    kind: NodeKindSchema,
    label: z.string().max(200),
    notes: z.string().max(4000),
    position: Vec3Schema,
    normal: Vec3Schema,
  })
  .superRefine((v, ctx) => {
    if (v.kind === 'socket' && !normalise(v.normal)) {
      ctx.addIssue({
        code: 'custom',
        path: ['normal', 0],
        message: 'a socket needs a normal that is not zero',
      });
    }
  });
type NodeFormValues = z.infer<typeof NodeFormSchema>;

export const KIND_OPTIONS = NODE_KINDS.map((k) => ({ value: k, label: k }));
/**
 * Only what the user changed is sent, so re-applying after someone else's edit leaves their other
 * fields alone.
 */
export function changedFields(node: StationNode, next: NodeChanges): NodeChanges {
  const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
  return Object.fromEntries(
    Object.entries(next).filter(([k, v]) => !same(node[k as keyof StationNode], v)),
  ) as NodeChanges;
}

const round3 = (v: number) => Math.round(v * 1000) / 1000;
const round3v = (v: Vec3): Vec3 => [round3(v[0]), round3(v[1]), round3(v[2])];

interface NodeFormProps {
  graph: EditableGraph;
  /** the node being changed; absent: a new node */
  node?: StationNode;
  /** the selected node, whose key prefix a new node's key follows when nothing was picked */
  selectedKey?: string | null;
  pick?: SurfacePick | null;
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
  /** told whether the form holds a change not saved (typed, then not typed back) */
  onDirtyChange?: (dirty: boolean) => void;
}

export function NodeForm({
  graph,
  node,
  selectedKey,
  pick,
  isSaving,
  onSubmit,
  onDirtyChange,
}: NodeFormProps) {
  const isNew = !node;
  const firstPrefix = (selectedKey && keyPrefix(selectedKey)) ?? graph.segments[0]?.key ?? 'N';
  const [firstKey] = useState(() =>
    suggestNodeKey(
      graph.nodes.map((n) => n.key),
      firstPrefix,
      'anchor',
    ),
  );
  const prefixRef = useRef(firstPrefix);
  /** the key last suggested: while the key field still holds it, a new suggestion replaces it */
  const suggested = useRef(firstKey);
  const suggest = (kind: NodeKind) => {
    suggested.current = suggestNodeKey(
      graph.nodes.map((n) => n.key),
      prefixRef.current,
      kind,
    );
    return suggested.current;
  };
  const [armed, setArmed] = useState(false);
  const [snappedTo, setSnappedTo] = useState<string | null>(null);
  const consumed = useRef(pick);

  const form = useZodForm(NodeFormSchema, {
    defaultValues: node
      ? {
          key: node.key,
          kind: node.kind,
          label: node.label ?? '',
          notes: node.notes ?? '',
          position: [...node.position],
          normal: node.normal ? [...node.normal] : [0, 0, 1],
        }
      : {
          key: firstKey,
          kind: 'anchor',
          label: '',
          notes: '',
          position: [0, 0, 0],
          normal: [0, 0, 1],
        },
  });
  const {
    register,
    control,
    setValue,
    getValues,
    setError,
    formState: { errors },
  } = form;
  const [kind, position, normal] = useWatch({ control, name: ['kind', 'position', 'normal'] });
  const { isDirty } = form.formState;
  // before the next click: selecting another node right after typing asks first
  useLayoutEffect(() => onDirtyChange?.(isDirty), [isDirty, onDirtyChange]);

  useEffect(() => {
    if (!isNew || !armed || !pick || pick === consumed.current) return;
    consumed.current = pick;
    const snap = nearestFacePoint(graph.segments, pick.point);
    const point = snap?.point ?? pick.point;
    const faceNormal = normalise(snap?.normal ?? pick.normal) ?? [0, 0, 1];
    const segment = snap?.segment ?? pick.segmentKey;
    const opts = { shouldValidate: true, shouldDirty: true };
    setValue('position', round3v(point), opts);
    setValue('normal', round3v(faceNormal), opts);
    if (segment) {
      prefixRef.current = segment;
      if (getValues('key') === suggested.current) setValue('key', suggest(getValues('kind')), opts);
    }
    setSnappedTo(segment ?? null);
    setArmed(false);
    // suggest reads refs only
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [pick, armed, isNew, graph.segments, setValue, getValues]);

  const kindField = register('kind');

  const submit = (v: NodeFormValues) => {
    const socketNormal = v.kind === 'socket' ? (normalise(v.normal) ?? undefined) : undefined;
    if (node) {
      const changes = changedFields(node, {
        kind: v.kind,
        label: v.label.trim() || null,
        notes: v.notes.trim() || null,
        position: v.position,
        ...(socketNormal ? { normal: socketNormal } : {}),
      });
      if (Object.keys(changes).length) onSubmit({ type: 'update-node', key: node.key, node: changes });
      else setError('root', { message: 'Nothing changed.' });
      return;
    }
    if (graph.nodes.some((n) => n.key === v.key)) {
      setError('key', { message: `${v.key} is already used on this station` });
      return;
    }
    const parsed = NodeSchema.safeParse({
      key: v.key,
      kind: v.kind,
      label: v.label.trim() || undefined,
      notes: v.notes.trim() || undefined,
      position: v.position,
      normal: socketNormal,
    });
    if (!parsed.success) {
      for (const issue of parsed.error.issues)
        setError(issue.path.join('.') as 'key', { message: issue.message });
      return;
    }
    onSubmit({ type: 'create-node', node: parsed.data });
  };

  const nudge = (axis: 0 | 1 | 2, delta: number) =>
    setValue(`position.${axis}`, round3(Number(getValues(`position.${axis}`)) + delta), {
      shouldDirty: true,
      shouldValidate: true,
    });

  const vecErrors = (e: typeof errors.position) => [0, 1, 2].map((i) => e?.[i]?.message ?? e?.message);

  return (
    <Form
      form={form}
      onSubmit={submit}
      className="space-y-3"
      aria-label={isNew ? 'Add node' : `Change node ${node.key}`}
    >
      {isNew && (
        <div className="space-y-1">
          <Button
            variant={armed ? 'primary' : 'secondary'}
            size="sm"
            aria-pressed={armed}
            onClick={() => setArmed((a) => !a)}
          >
            {armed ? 'Click a truss surface… (cancel)' : 'Pick a point on the truss'}
          </Button>
          <p className="text-xs text-text-muted" aria-live="polite">
            {armed
              ? 'Click a segment surface in the 3D view; the point snaps to the nearest face.'
              : snappedTo
                ? `Snapped to a face of ${snappedTo}; the socket normal is that face's outward normal.`
                : 'Or type the position below.'}
          </p>
        </div>
      )}
      <div className="grid grid-cols-2 gap-2">
        <Field
          label="Key"
          error={errors.key?.message}
          hint={isNew ? 'Next free key suggested' : 'Keys cannot be renamed'}
        >
          <Input autoComplete="off" readOnly={!isNew} className="font-mono" {...register('key')} />
        </Field>
        <Field label="Kind" error={errors.kind?.message}>
          <Select
            options={KIND_OPTIONS}
            {...kindField}
            onChange={(e) => {
              void kindField.onChange(e);
              if (isNew && getValues('key') === suggested.current)
                setValue('key', suggest(e.target.value as NodeKind));
            }}
          />
        </Field>
      </div>
      <Field label="Label" error={errors.label?.message}>
        <Input autoComplete="off" {...register('label')} />
      </Field>
      <Vec3Fields
        legend="Position"
        values={position}
        errors={vecErrors(errors.position)}
        fields={
          [0, 1, 2].map((i) => register(`position.${i as 0 | 1 | 2}`, { valueAsNumber: true })) as never
        }
        onNudge={nudge}
      />
      {kind === 'socket' && (
        <Vec3Fields
          legend="Socket normal (saved as a unit vector)"
          lengths={false}
          values={normal}
          errors={vecErrors(errors.normal)}
          fields={
            [0, 1, 2].map((i) => register(`normal.${i as 0 | 1 | 2}`, { valueAsNumber: true })) as never
          }
        />
      )}
      <Field label="Notes" error={errors.notes?.message}>
        <textarea rows={2} className={cn(controlClass, 'py-2')} {...register('notes')} />
      </Field>
      <FormActions submit={isNew ? 'Add node' : 'Save node'} isLoading={isSaving}>
        <p role="status" className="text-sm text-text-muted">
          {errors.root?.message}
        </p>
      </FormActions>
    </Form>
  );
}
