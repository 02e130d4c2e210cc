import type { ReactNode } from 'react';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';

/** A pill that is on or off: an item a task needs at hand, a task it starts after. */
export function ToggleChip({
  on,
  onToggle,
  disabled,
  title,
  children,
}: {
  on: boolean;
  onToggle: () => void;
  disabled?: boolean;
  title?: string;
  children: ReactNode;
}) {
  return (
    <button
      type="button"
      aria-pressed={on}
      disabled={disabled}
      title={title}
      onClick={onToggle}
      className={cn(
        'rounded-full border px-3 py-1 text-sm disabled:opacity-50',
        focusRing,
        on
          ? 'border-accent bg-accent-soft font-medium text-accent-strong'
          : 'border-surface-line bg-surface-panel text-text',
      )}
    >
      <span aria-hidden="true">{on ? '✓ ' : '+ '}</span>
      {children}
    </button>
  );
}
