import type { ChangeEvent, ChangeKind } from '@shared/schemas/events';

const numberIn = (o: unknown, key: string): number | undefined => {
  const v = o && typeof o === 'object' ? (o as Record<string, unknown>)[key] : undefined;
  return typeof v === 'number' ? v : undefined;
};

/** A route's `emits` for a write that answers the record (its `id` and `version`). */
export const answered =
  (kind: ChangeKind) =>
  (_input: unknown, result: unknown): ChangeEvent | null => {
    const id = numberIn(result, 'id');
    if (id === undefined) return null;
    const version = numberIn(result, 'version');
    return { kind, id, ...(version === undefined ? {} : { version }) };
  };

/** A route's `emits` for a write to the record named by `:id` (its version in the answer, if any). */
export const atParam =
  (kind: ChangeKind, opts: { deleted?: true } = {}) =>
  (input: { params: { id: number } }, result: unknown): ChangeEvent => {
    const version = numberIn(result, 'version');
    return { kind, id: input.params.id, ...(version === undefined ? {} : { version }), ...opts };
  };
