import { useId, useRef, type KeyboardEvent, type ReactNode } from 'react';
import { focusRing } from './button';
import { cn } from '@/lib/cn';

export interface PanelTab {
  id: string;
  label: string;
  render: () => ReactNode;
}

/** ARIA tabs: arrow keys move between tabs, Home and End jump to the ends. */
export function PanelTabs({
  tabs,
  active,
  onChange,
  label,
  flush = false,
  fill = false,
}: {
  tabs: readonly PanelTab[];
  active: string;
  onChange: (id: string) => void;
  label: string;
  /** panels without padding (a list that runs to the edges) */
  flush?: boolean;
  /** the tabs take their container's height and a panel's content fills it (it scrolls itself) */
  fill?: boolean;
}) {
  const base = useId();
  const refs = useRef<Record<string, HTMLButtonElement | null>>({});
  const current = tabs.find((t) => t.id === active) ?? tabs[0];
  const move = (e: KeyboardEvent, index: number) => {
    const to = { ArrowRight: index + 1, ArrowLeft: index - 1, Home: 0, End: tabs.length - 1 }[e.key];
    if (to === undefined) return;
    e.preventDefault();
    const tab = tabs[(to + tabs.length) % tabs.length];
    onChange(tab.id);
    refs.current[tab.id]?.focus();
  };
  return (
    <div className={cn('flex min-h-0 flex-col', fill && 'flex-1')}>
      <div role="tablist" aria-label={label} className="flex gap-1 border-b border-surface-line px-2">
        {tabs.map((tab, i) => {
          const selected = tab.id === current?.id;
          return (
            <button
              key={tab.id}
              ref={(el) => {
                refs.current[tab.id] = el;
              }}
              type="button"
              role="tab"
              id={`${base}-tab-${tab.id}`}
              aria-selected={selected}
              aria-controls={`${base}-panel-${tab.id}`}
              tabIndex={selected ? 0 : -1}
              onClick={() => onChange(tab.id)}
              onKeyDown={(e) => move(e, i)}
              className={cn(
                '-mb-px rounded-t-md border-b-2 px-3 py-2 text-sm font-medium',
                focusRing,
                selected
                  ? 'border-accent text-accent-strong'
                  : 'border-transparent text-text-muted hover:text-text-strong',
              )}
            >
              {tab.label}
            </button>
          );
        })}
      </div>
      {current && (
        <div
          key={current.id}
          role="tabpanel"
          id={`${base}-panel-${current.id}`}
          aria-labelledby={`${base}-tab-${current.id}`}
          className={cn('relative min-h-0 flex-1 overflow-y-auto', !flush && 'p-4', fill && 'flex flex-col')}
        >
          {current.render()}
        </div>
      )}
    </div>
  );
}
