import { useEffect, useId, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import type { GraphArrays } from '@shared/compute/graph-columns';
import { NODE_KINDS } from '@shared/schemas/station';
import { Input } from '@/components/ui/input';
import { cn } from '@/lib/cn';

const SHOWN = 200;

/**
 * The station's nodes as a searchable listbox, the keyboard way into the model: type to filter by
 * key or label, arrows move, Enter selects (the 3D view follows).
 */
export function NodeList({
  arrays,
  selectedKey,
  onSelect,
  floating = false,
  className,
}: {
  /** the station's nodes in columns (keys, kinds, labels): no object per node */
  arrays: Pick<GraphArrays, 'keys' | 'kinds' | 'labels'>;
  selectedKey: string | null;
  onSelect: (key: string) => void;
  /**
   * over the 3D view: the search box always there, the list only while the finder has focus, so
   * the model is not covered once a node is chosen
   */
  floating?: boolean;
  className?: string;
}) {
  const id = useId();
  const [query, setQuery] = useState('');
  const [focused, setFocused] = useState(false);
  const listShown = !floating || focused;
  const [active, setActive] = useState(0);
  const listRef = useRef<HTMLUListElement>(null);
  const { keys, kinds, labels } = arrays;
  const total = keys.length;
  // the indices of the nodes that match, in the station's order
  const matches = useMemo(() => {
    const q = query.trim().toLowerCase();
    if (!q) return null;
    const out: number[] = [];
    for (let i = 0; i < keys.length; i++)
      if (keys[i].toLowerCase().includes(q) || labels[i]?.toLowerCase().includes(q)) out.push(i);
    return out;
  }, [keys, labels, query]);
  const matched = matches?.length ?? total;
  const shown = Array.from({ length: Math.min(SHOWN, matched) }, (_, j) => {
    const i = matches ? matches[j] : j;
    return { key: keys[i], label: labels[i], kind: NODE_KINDS[kinds[i]] };
  });

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
    <div
      className={cn(
        'flex min-h-0 flex-col gap-2',
        floating && 'rounded-lg border border-surface-line bg-surface-panel/95 p-2 shadow-lg',
        className,
      )}
      onFocus={() => setFocused(true)}
      onBlur={(e) => {
        if (!e.currentTarget.contains(e.relatedTarget as Node | null)) setFocused(false);
      }}
      onKeyDown={(e) => {
        if (floating && e.key === 'Escape') (document.activeElement as HTMLElement | null)?.blur();
      }}
    >
      <label
        htmlFor={`${id}-search`}
        className={floating ? 'sr-only' : 'text-sm font-medium text-text-strong'}
      >
        Find a node
      </label>
      <Input
        id={`${id}-search`}
        type="search"
        placeholder={floating ? 'Find a node: key or label, e.g. PB3-A07' : 'Key or label, e.g. PB3-A07'}
        value={query}
        role="combobox"
        aria-expanded={listShown}
        aria-controls={`${id}-list`}
        aria-activedescendant={shown[active] ? optionId(active) : undefined}
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onKeyDown={onKeyDown}
      />
      <p className={cn('text-xs text-text-muted', !listShown && 'sr-only')} aria-live="polite">
        {matched === total ? `${total} nodes` : `${matched} of ${total} nodes match`}
        {matched > SHOWN && ` — first ${SHOWN} shown, type more to narrow`}
      </p>
      <ul
        ref={listRef}
        hidden={!listShown}
        id={`${id}-list`}
        role="listbox"
        aria-label="Nodes"
        tabIndex={0}
        aria-activedescendant={shown[active] ? optionId(active) : undefined}
        onKeyDown={onKeyDown}
        className={cn(
          'min-h-0 flex-1 overflow-y-auto rounded-md border border-surface-line bg-surface-panel focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-accent',
          floating && 'max-h-[min(24rem,50vh)]',
        )}
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
              // a press on an option keeps the focus (and so the open list) in the finder
              onMouseDown={(e) => e.preventDefault()}
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
