import type { ComponentProps, ReactNode } from 'react';
import {
  useForm,
  type FieldValues,
  type SubmitHandler,
  type UseFormProps,
  type UseFormReturn,
} from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { useReportUnsaved } from '../unsaved-edits';
import { Button, type ButtonProps } from './button';

/**
 * react-hook-form checked by a zod schema: the fields hold the schema's input, and a submit hands
 * over its output. Feed it the contract's own schema (or one built from its field schemas), so the
 * client refuses what the server would.
 */
export function useZodForm<TInput extends FieldValues, TOutput>(
  schema: z.ZodType<TOutput, TInput>,
  options?: Omit<UseFormProps<NoInfer<TInput>, unknown, NoInfer<TOutput>>, 'resolver'>,
): UseFormReturn<TInput, unknown, TOutput> {
  return useForm<TInput, unknown, TOutput>({ ...options, resolver: zodResolver(schema) });
}

interface FormProps<TInput extends FieldValues, TOutput> extends Omit<ComponentProps<'form'>, 'onSubmit'> {
  form: UseFormReturn<TInput, unknown, TOutput>;
  /** called with the schema's output once every field is valid */
  onSubmit: SubmitHandler<TOutput>;
}

/**
 * The form element of a `useZodForm`: the browser's own validation off, ours on submit. A form
 * holding edits not submitted says so to the page (`useReportUnsaved`), which asks before leaving.
 */
export function Form<TInput extends FieldValues, TOutput>({
  form,
  onSubmit,
  className = 'space-y-4',
  children,
  ...props
}: FormProps<TInput, TOutput>) {
  useReportUnsaved(form.formState.isDirty);
  return (
    <form noValidate className={className} onSubmit={form.handleSubmit(onSubmit)} {...props}>
      {children}
    </form>
  );
}

interface FormActionsProps {
  /** the submit button's words */
  submit: string;
  onCancel?: () => void;
  isLoading?: boolean;
  disabled?: boolean;
  variant?: ButtonProps['variant'];
  size?: ButtonProps['size'];
  /** shown before the buttons, e.g. a status line */
  children?: ReactNode;
}

/** A form's footer: anything said about the form, then Cancel (when it can be), then the submit. */
export function FormActions({
  submit,
  onCancel,
  isLoading,
  disabled,
  variant,
  size,
  children,
}: FormActionsProps) {
  return (
    <div className="flex items-center justify-end gap-2 pt-2">
      {children}
      {onCancel && (
        <Button variant="secondary" size={size} onClick={onCancel}>
          Cancel
        </Button>
      )}
      <Button type="submit" variant={variant} size={size} isLoading={isLoading} disabled={disabled}>
        {submit}
      </Button>
    </div>
  );
}
