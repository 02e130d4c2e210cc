import type { ReactNode } from 'react';
import type { FieldValues, Path, SubmitHandler, UseFormReturn } from 'react-hook-form';
import { Field } from '@/components/ui/field';
import { Form, FormActions } from '@/components/ui/form';
import { Input } from '@/components/ui/input';

interface KeyedItemFormProps<TInput extends FieldValues & { key: string }, TOutput> {
  form: UseFormReturn<TInput, unknown, TOutput>;
  onSubmit: SubmitHandler<TOutput>;
  /** what the thing is, for the form's name and its button: "hazard", "arm" */
  noun: string;
  /** the key of the item changed; undefined when adding one */
  itemKey?: string;
  keyLabel: string;
  /** the field beside the key */
  beside: ReactNode;
  /** the fields after the key's row */
  children: ReactNode;
  isSaving: boolean;
  onCancel?: () => void;
}

/**
 * A form for one keyed item of the station (an arm, a hazard): named for what it does, the key first
 * (fixed once the item exists) beside one field, the rest, then Save (or Add) and Cancel.
 */
export function KeyedItemForm<TInput extends FieldValues & { key: string }, TOutput>({
  form,
  onSubmit,
  noun,
  itemKey,
  keyLabel,
  beside,
  children,
  isSaving,
  onCancel,
}: KeyedItemFormProps<TInput, TOutput>) {
  const changing = itemKey !== undefined;
  return (
    <Form
      form={form}
      onSubmit={onSubmit}
      className="space-y-3"
      aria-label={changing ? `Change ${noun} ${itemKey}` : `Add ${noun}`}
    >
      <div className="grid grid-cols-2 gap-2">
        <Field label={keyLabel} error={form.formState.errors.key?.message as string | undefined}>
          <Input
            autoComplete="off"
            readOnly={changing}
            className="font-mono"
            {...form.register('key' as Path<TInput>)}
          />
        </Field>
        {beside}
      </div>
      {children}
      <FormActions
        submit={changing ? `Save ${noun}` : `Add ${noun}`}
        onCancel={onCancel}
        isLoading={isSaving}
      />
    </Form>
  );
}
