import { useId, useMemo, useState, type KeyboardEvent } from 'react';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { cn } from '@/lib/cn';

export interface NodeOption {
  key: string;
  label?: string;
  kind: string;
}

const MAX_MATCHES = 12;

/** Node keys first by key prefix, then by any match in key or label. */
export function matchNodes(options: readonly NodeOption[], text: string, limit = MAX_MATCHES): NodeOption[] {
  const q = text.trim().toLowerCase();
  if (!q) return options.slice(0, limit);
  const prefix: NodeOption[] = [];
  const inside: NodeOption[] = [];
  for (const o of options) {
    const key = o.key.toLowerCase();
    if (key.startsWith(q)) prefix.push(o);
    else if (key.includes(q) || o.label?.toLowerCase().includes(q)) inside.push(o);
    if (prefix.length >= limit) break;
  }
  return [...prefix, ...inside].slice(0, limit);
}

interface NodePickerProps {
  label: string;
  value: string;
  onChange: (key: string) => void;
  options: readonly NodeOption[];
  error?: string;
  picking: boolean;
  onTogglePick: () => void;
}

/** A type-ahead over node keys and labels (ARIA combobox), with "pick in 3D" for the next clicked node. */
export function NodePicker({
  label,
  value,
  onChange,
  options,
  error,
  picking,
  onTogglePick,
}: NodePickerProps) {
  const id = useId();
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const matches = useMemo(() => matchNodes(options, value), [options, value]);
  const listId = `${id}-list`;
  const errorId = `${id}-error`;

  const choose = (key: string) => {
    onChange(key);
    setOpen(false);
  };
  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      e.preventDefault();
      setOpen(true);
      const step = e.key === 'ArrowDown' ? 1 : -1;
      setActive((i) => (matches.length ? (i + step + matches.length) % matches.length : 0));
    } else if (e.key === 'Enter' && open && matches[active]) {
      e.preventDefault();
      choose(matches[active].key);
    } else if (e.key === 'Escape') {
      setOpen(false);
    }
  };

  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-text-strong">
        {label}
      </label>
      <div className="flex gap-2">
        <div className="relative flex-1">
          <Input
            id={id}
            role="combobox"
            aria-expanded={open && matches.length > 0}
            aria-controls={listId}
            aria-autocomplete="list"
            aria-activedescendant={open && matches[active] ? `${id}-opt-${active}` : undefined}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? errorId : undefined}
            autoComplete="off"
            spellCheck={false}
            placeholder="Key or label, e.g. PB3-A07"
            value={value}
            onChange={(e) => {
              onChange(e.target.value);
              setActive(0);
              setOpen(true);
            }}
            onFocus={() => setOpen(true)}
            onBlur={() => setOpen(false)}
            onKeyDown={onKeyDown}
          />
          {open && matches.length > 0 && (
            <ul
              id={listId}
              role="listbox"
              aria-label={`${label} matches`}
              className="absolute z-30 mt-1 max-h-64 w-full overflow-y-auto rounded-md border border-surface-line bg-surface-panel py-1 shadow-lg"
            >
              {matches.map((o, i) => (
                <li
                  key={o.key}
                  id={`${id}-opt-${i}`}
                  role="option"
                  aria-selected={i === active}
                  // mousedown, not click: the input's blur would close the list first
                  onMouseDown={(e) => {
                    e.preventDefault();
                    choose(o.key);
                  }}
                  className={cn(
                    'flex cursor-pointer items-baseline gap-2 px-3 py-1.5 text-sm',
                    i === active ? 'bg-accent-soft text-accent-strong' : 'text-text-strong',
                  )}
                >
                  <span className="font-mono font-semibold">{o.key}</span>
                  <span className="truncate text-xs text-text-muted">
                    {o.kind}
                    {o.label ? ` · ${o.label}` : ''}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </div>
        <Button variant={picking ? 'primary' : 'secondary'} aria-pressed={picking} onClick={onTogglePick}>
          {picking ? 'Click a node…' : 'Pick in 3D'}
        </Button>
      </div>
      <p id={errorId} aria-live="polite" className="text-sm text-danger empty:hidden">
        {error}
      </p>
    </div>
  );
}
