import { useEffect, useId, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import type { StationNode } from '@shared/schemas/station';
import { Input } from '@/components/ui/input';
import { cn } from '@/lib/cn';

const SHOWN = 200;

/**
 * The station's nodes as a searchable listbox, the keyboard way into the model: type to filter by
 * key or label, arrows move, Enter selects (the 3D view follows).
 */
export function NodeList({
  nodes,
  selectedKey,
  onSelect,
}: {
  nodes: readonly StationNode[];
  selectedKey: string | null;
  onSelect: (key: string) => void;
}) {
  const id = useId();
  const [query, setQuery] = useState('');
  const [active, setActive] = useState(0);
  const listRef = useRef<HTMLUListElement>(null);
  const matches = useMemo(() => {
    const q = query.trim().toLowerCase();
    return q
      ? nodes.filter((n) => n.key.toLowerCase().includes(q) || n.label?.toLowerCase().includes(q))
      : nodes;
  }, [nodes, query]);
  const shown = matches.slice(0, SHOWN);

  // a selection made elsewhere (a click in 3D) moves the list's cursor to it
  const [followed, setFollowed] = useState(selectedKey);
  if (selectedKey !== followed) {
    setFollowed(selectedKey);
    const i = selectedKey ? shown.findIndex((n) => n.key === selectedKey) : -1;
    if (i >= 0) setActive(i);
  }
  useEffect(() => {
    listRef.current?.querySelector(`[data-index="${active}"]`)?.scrollIntoView({ block: 'nearest' });
  }, [active]);

  const onKeyDown = (e: KeyboardEvent) => {
    const last = shown.length - 1;
    const moves: Record<string, number> = {
      ArrowDown: active + 1,
      ArrowUp: active - 1,
      PageDown: active + 10,
      PageUp: active - 10,
    };
    // in the search box Home and End move the caret; in the list they jump to its ends
    if (e.currentTarget.tagName !== 'INPUT') Object.assign(moves, { Home: 0, End: last });
    const to = moves[e.key];
    if (to !== undefined) {
      e.preventDefault();
      setActive(Math.max(0, Math.min(last, to)));
    } else if (e.key === 'Enter' && shown[active]) {
      e.preventDefault();
      onSelect(shown[active].key);
    }
  };

  const optionId = (i: number) => `${id}-opt-${i}`;
  return (
    <div className="flex min-h-0 flex-col gap-2">
      <label htmlFor={`${id}-search`} className="text-sm font-medium text-text-strong">
        Find a node
      </label>
      <Input
        id={`${id}-search`}
        type="search"
        placeholder="Key or label, e.g. PB3-A07"
        value={query}
        role="combobox"
        aria-expanded="true"
        aria-controls={`${id}-list`}
        aria-activedescendant={shown[active] ? optionId(active) : undefined}
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onKeyDown={onKeyDown}
      />
      <p className="text-xs text-text-muted" aria-live="polite">
        {matches.length === nodes.length
          ? `${nodes.length} nodes`
          : `${matches.length} of ${nodes.length} nodes match`}
        {matches.length > SHOWN && ` — first ${SHOWN} shown, type more to narrow`}
      </p>
      <ul
        ref={listRef}
        id={`${id}-list`}
        role="listbox"
        aria-label="Nodes"
        tabIndex={0}
        aria-activedescendant={shown[active] ? optionId(active) : undefined}
        onKeyDown={onKeyDown}
        className="min-h-0 flex-1 overflow-y-auto rounded-md border border-surface-line bg-surface-panel focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-accent"
      >
        {shown.map((node, i) => {
          const selected = node.key === selectedKey;
          return (
            <li
              key={node.key}
              id={optionId(i)}
              data-index={i}
              role="option"
              aria-selected={selected}
              onClick={() => {
                setActive(i);
                onSelect(node.key);
              }}
              className={cn(
                'flex cursor-pointer items-baseline justify-between gap-2 border-l-4 px-2.5 py-1.5 text-sm',
                i === active ? 'bg-surface-sunken' : '',
                selected ? 'border-accent font-semibold text-accent-strong' : 'border-transparent text-text',
              )}
            >
              <span className="truncate">
                <span className="font-mono">{node.key}</span>
                {node.label && <span className="text-text-muted"> {node.label}</span>}
              </span>
              <span className="shrink-0 text-xs text-text-muted"> {node.kind}</span>
            </li>
          );
        })}
        {shown.length === 0 && (
          <li className="px-2.5 py-2 text-sm text-text-muted">No node matches “{query}”.</li>
        )}
      </ul>
    </div>
  );
}
