import { useEffect, useRef, useState } from 'react';
import { CreateAnnotationInputSchema, type Annotation } from '@shared/schemas/annotations';
import type { Vec3 } from '@shared/schemas/station';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { Input, controlClass } from '@/components/ui/input';
import { cn } from '@/lib/cn';
import { useCreateAnnotation } from '../api/write-annotation';
import { pinText } from './annotation-meta';

/** A surface click in the 3D view; each click is a new object. */
export interface PointPick {
  point: Vec3;
  segmentKey?: string;
}

interface NewAnnotationFormProps {
  stationId: number;
  selectedNodeKey: string | null;
  pick: PointPick | null;
  onCreated: (annotation: Annotation) => void;
  onCancel: () => void;
}

const round3 = (v: number) => Math.round(v * 1000) / 1000;

export function NewAnnotationForm({
  stationId,
  selectedNodeKey,
  pick,
  onCreated,
  onCancel,
}: NewAnnotationFormProps) {
  const [pinTo, setPinTo] = useState<'node' | 'point'>(selectedNodeKey ? 'node' : 'point');
  const [point, setPoint] = useState<{ position: Vec3; segmentKey?: string } | null>(null);
  const [armed, setArmed] = useState(!selectedNodeKey);
  const consumed = useRef(pick);
  const create = useCreateAnnotation({ onSuccess: onCreated });
  const form = useZodForm(CreateAnnotationInputSchema, { defaultValues: { title: '', body: '' } });
  const {
    register,
    setValue,
    formState: { errors },
  } = form;

  useEffect(() => {
    if (!armed || !pick || pick === consumed.current) return;
    consumed.current = pick;
    setPoint({
      position: [round3(pick.point[0]), round3(pick.point[1]), round3(pick.point[2])],
      segmentKey: pick.segmentKey,
    });
    setArmed(false);
  }, [pick, armed]);

  // the pin is chosen outside the inputs; the form holds it so the schema checks it with the rest
  useEffect(() => {
    setValue('nodeKey', pinTo === 'node' ? (selectedNodeKey ?? '') : undefined);
    setValue('position', pinTo === 'point' ? point?.position : undefined);
  }, [pinTo, selectedNodeKey, point, setValue]);
  const pinError = errors.nodeKey?.message ?? errors.position?.message;

  return (
    <Form
      form={form}
      onSubmit={(data) => create.mutate({ stationId, data })}
      className="space-y-3"
      aria-label="New note"
    >
      <FormError error={create.error} fallback="The note could not be saved." />
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold text-text-strong">Pin to</legend>
        <label className="flex items-center gap-2 text-sm">
          <input
            type="radio"
            name="pin-to"
            checked={pinTo === 'node'}
            disabled={!selectedNodeKey}
            onChange={() => setPinTo('node')}
            className="accent-accent"
          />
          {selectedNodeKey ? (
            <span>
              the selected node <span className="font-mono">{selectedNodeKey}</span>
            </span>
          ) : (
            <span className="text-text-muted">the selected node (select one first)</span>
          )}
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input
            type="radio"
            name="pin-to"
            checked={pinTo === 'point'}
            onChange={() => setPinTo('point')}
            className="accent-accent"
          />
          <span>
            a point on the model
            {point && (
              <>
                : <span className="font-mono">{pinText({ nodeKey: null, position: point.position })}</span>
                {point.segmentKey && ` on ${point.segmentKey}`}
              </>
            )}
          </span>
        </label>
        {pinTo === 'point' && (
          <Button
            size="sm"
            variant={armed ? 'primary' : 'secondary'}
            aria-pressed={armed}
            onClick={() => setArmed(!armed)}
          >
            {armed
              ? 'Click a surface in the 3D view… (cancel)'
              : point
                ? 'Pick another point'
                : 'Pick a point'}
          </Button>
        )}
        <p aria-live="polite" className="text-sm text-danger empty:hidden">
          {pinError}
        </p>
      </fieldset>
      <Field label="Title" error={errors.title?.message}>
        <Input autoComplete="off" {...register('title')} />
      </Field>
      <Field label="Note" error={errors.body?.message}>
        <textarea rows={4} className={cn(controlClass, 'py-2')} {...register('body')} />
      </Field>
      <FormActions submit="Pin note" onCancel={onCancel} isLoading={create.isPending} />
    </Form>
  );
}
