import type { ReactNode } from 'react';
import { Button } from '@/components/ui/button';

interface KeyedRowProps {
  /** what the thing is, for the buttons' names: "hazard", "arm" */
  noun: string;
  itemKey: string;
  /** what is said after the key */
  children?: ReactNode;
  removeWord: 'Delete' | 'Remove';
  isSaving: boolean;
  onChange: () => void;
  onRemove: () => void;
}

/** One row of a station's keyed list (hazards, arms): its key, a few facts, Change and Delete. */
export function KeyedRow({
  noun,
  itemKey,
  children,
  removeWord,
  isSaving,
  onChange,
  onRemove,
}: KeyedRowProps) {
  return (
    <li className="flex flex-wrap items-center gap-2 py-2">
      <span className="flex-1 font-mono">{itemKey}</span>
      {children}
      <Button size="sm" variant="secondary" aria-label={`Change ${noun} ${itemKey}`} onClick={onChange}>
        Change
      </Button>
      <Button
        size="sm"
        variant="ghost"
        disabled={isSaving}
        aria-label={`${removeWord} ${noun} ${itemKey}`}
        onClick={onRemove}
      >
        {removeWord}
      </Button>
    </li>
  );
}
