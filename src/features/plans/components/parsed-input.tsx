import { useEffect, useRef, useState } from 'react';
import type { z } from 'zod';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { useReportFieldError } from '../lib/field-validity';

interface ParsedInputProps<T> {
  label: string;
  hint?: string;
  value: T | null;
  format: (value: T | null) => string;
  /** the field's schema, e.g. `lengthText(...)`: text in, the stored value out */
  schema: z.ZodType<T | null | undefined, string>;
  onCommit: (value: T | null) => void;
  readOnly: boolean;
}

/**
 * A number typed as text (`85 ft`, `1:30`): the draft changes only when the text reads as a valid
 * value, so half-typed input never reaches a save.
 */
export function ParsedInput<T = number>({
  label,
  hint,
  value,
  format,
  schema,
  onCommit,
  readOnly,
}: ParsedInputProps<T>) {
  const [text, setText] = useState(() => format(value));
  const [error, setError] = useState<string>();
  const focused = useRef(false);
  // the draft keeps the last good value: the page's save state must still say this field is not saved
  useReportFieldError(readOnly ? undefined : error);

  useEffect(() => {
    if (!focused.current) setText(format(value));
  }, [value, format]);

  return (
    <Field label={label} hint={hint} error={error}>
      <Input
        value={text}
        readOnly={readOnly}
        className="read-only:bg-surface-sunken"
        autoComplete="off"
        onFocus={() => {
          focused.current = true;
        }}
        onBlur={() => {
          focused.current = false;
          if (!error) setText(format(value));
        }}
        onChange={(e) => {
          setText(e.target.value);
          const parsed = schema.safeParse(e.target.value);
          setError(parsed.success ? undefined : parsed.error.issues[0]?.message);
          if (parsed.success) onCommit(parsed.data ?? null);
        }}
      />
    </Field>
  );
}
