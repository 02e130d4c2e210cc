import { useEffect, useMemo, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';
import { useVirtualizer } from '@tanstack/react-virtual';
import { graphArraysOf, type GraphArrays } from '@shared/compute/graph-columns';
import { formatLength } from '@shared/compute/units';
import { EDGE_KINDS, HAZARD_KINDS, NODE_KINDS, type Hazard, type Vec3 } from '@shared/schemas/station';
import { focusRing } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Table, Td, Th } from '@/components/ui/table';
import { cn } from '@/lib/cn';
import { PanelTabs } from '@/components/ui/panel-tabs';
import { filterRows, ranksAmong, sortRows } from './row-index';
import type { SelectionViewProps, StationSelection } from './selection';

/** a row's height before one is measured: a cell's padding, a line of small text and its border */
const ROW_PX = 41;
/** rows made beyond each end of the visible ones, so a quick scroll or a Tab meets rows */
const OVERSCAN = 12;
/** rows one PageDown or PageUp moves the focus */
const PAGE_ROWS = 10;
const xyz = (v: Vec3) => v.map((c) => c.toFixed(2)).join(', ');

interface Column {
  id: string;
  header: string;
  /** what the column sorts by: numbers by size (largest first on the first click), text in natural order */
  value: (i: number) => number | string;
  /** what the cell shows, if not the value */
  cell?: (i: number) => ReactNode;
}

/** One table's rows, read by index from the station's columns: no object per row. */
interface RowSource {
  caption: string;
  count: number;
  columns: Column[];
  kinds: readonly string[];
  /** the row's kind, as an index into `kinds` */
  kindOf: (i: number) => number;
  /** what search by key matches (the row's name), lower-cased, contains `q` (lower-cased) */
  matches: (i: number, q: string) => boolean;
  /** the row's name: its key, or an edge's ends */
  name: (i: number) => string;
  selection: (i: number) => NonNullable<StationSelection>;
}

const ranksKept = new WeakMap<RowSource, Map<string, Uint32Array>>();

/** A column's ranks (see ranksAmong), made when the column is first sorted and kept with its rows. */
function ranksOf(source: RowSource, column: Column): Uint32Array {
  let kept = ranksKept.get(source);
  if (!kept) ranksKept.set(source, (kept = new Map()));
  let ranks = kept.get(column.id);
  if (!ranks) kept.set(column.id, (ranks = ranksAmong(source.count, column.value)));
  return ranks;
}

interface Sorting {
  id: string;
  descending: boolean;
}

function DataTable({
  source,
  selection,
  onSelect,
}: {
  source: RowSource;
  selection: StationSelection;
  onSelect: (s: StationSelection) => void;
}) {
  const { caption, columns, count, kinds } = source;
  const [sorting, setSorting] = useState<Sorting | null>(null);
  const [search, setSearch] = useState('');
  const [kind, setKind] = useState('');
  const filtered = useMemo(() => {
    const q = search.trim().toLowerCase();
    const k = kind ? kinds.indexOf(kind) : -1;
    const keep =
      q && k >= 0
        ? (i: number) => source.kindOf(i) === k && source.matches(i, q)
        : q
          ? (i: number) => source.matches(i, q)
          : k >= 0
            ? (i: number) => source.kindOf(i) === k
            : null;
    return filterRows(count, keep);
  }, [source, count, kinds, search, kind]);
  const rows = useMemo(() => {
    const column = sorting && columns.find((c) => c.id === sorting.id);
    return column ? sortRows(filtered, ranksOf(source, column), sorting.descending) : filtered;
  }, [source, filtered, sorting, columns]);
  const toggleSort = (column: Column) => {
    const first = count > 0 && typeof column.value(0) === 'number';
    // none, then the first direction, then the other, then none again
    if (sorting?.id !== column.id) setSorting({ id: column.id, descending: first });
    else if (sorting.descending === first) setSorting({ id: column.id, descending: !first });
    else setSorting(null);
  };

  const scrollRef = useRef<HTMLDivElement>(null);
  const [rowPx, setRowPx] = useState(ROW_PX);
  // eslint-disable-next-line react-hooks/incompatible-library
  const virtualizer = useVirtualizer({
    count: rows.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => rowPx,
    overscan: OVERSCAN,
  });
  const items = virtualizer.getVirtualItems();
  const padTop = items.length ? items[0].start : 0;
  const padBottom = items.length ? virtualizer.getTotalSize() - items[items.length - 1].end : 0;

  // the rows' real height, once one is laid out (the estimate is kept where nothing is laid out)
  useEffect(() => {
    const row = scrollRef.current?.querySelector<HTMLElement>('tbody tr[data-row]');
    const px = row?.getBoundingClientRect().height ?? 0;
    if (px > 0 && Math.abs(px - rowPx) > 0.5) setRowPx(px);
  }, [items.length, rowPx]);
  useEffect(() => virtualizer.measure(), [rowPx, virtualizer]);

  // the keyboard moves the focus from row to row; a row out of view is brought in, then focused
  const [focusTo, setFocusTo] = useState<number | null>(null);
  useEffect(() => {
    if (focusTo === null) return;
    const button = scrollRef.current?.querySelector<HTMLButtonElement>(`tr[data-row="${focusTo}"] button`);
    if (button) {
      button.focus();
      setFocusTo(null);
    }
  }, [focusTo, items]);
  const onRowKey = (e: KeyboardEvent, at: number) => {
    const last = rows.length - 1;
    const to = {
      ArrowDown: at + 1,
      ArrowUp: at - 1,
      PageDown: at + PAGE_ROWS,
      PageUp: at - PAGE_ROWS,
      Home: 0,
      End: last,
    }[e.key];
    if (to === undefined) return;
    e.preventDefault();
    const next = Math.max(0, Math.min(last, to));
    virtualizer.scrollToIndex(next, { align: 'auto' });
    setFocusTo(next);
  };

  return (
    // the rows' box fills the drawer (never its rows' height: the window would be every row), but
    // keeps room for a few rows: in a short drawer the panel scrolls to it instead
    <div className="flex min-h-0 flex-1 flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="block w-64 space-y-1 text-sm font-medium text-text-strong">
          <span>Search by key</span>
          <Input
            type="search"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            placeholder="e.g. PB3"
          />
        </label>
        <label className="block w-48 space-y-1 text-sm font-medium text-text-strong">
          <span>Kind</span>
          <Select
            value={kind}
            onChange={(e) => setKind(e.target.value)}
            options={[{ value: '', label: 'All kinds' }, ...kinds.map((k) => ({ value: k, label: k }))]}
          />
        </label>
        <p className="pb-2 text-sm text-text-muted" aria-live="polite">
          {rows.length} of {count} shown
        </p>
      </div>
      <Table
        caption={caption}
        ref={scrollRef}
        // a scroll box the keyboard can reach: arrows and Page keys scroll it, Tab enters its rows
        tabIndex={0}
        role="region"
        aria-label={`${caption} table, scrollable`}
        className={cn('min-h-40 flex-1 overflow-y-auto rounded-sm', focusRing)}
        rowCount={rows.length + 1}
      >
        <thead>
          <tr aria-rowindex={1}>
            {columns.map((column) => {
              const sorted = sorting?.id === column.id ? (sorting.descending ? 'desc' : 'asc') : null;
              return (
                <Th
                  key={column.id}
                  // a collapsed border scrolls away with the rows: the header's line is drawn on it
                  className="sticky top-0 z-10 bg-surface-panel after:absolute after:inset-x-0 after:bottom-0 after:border-b after:border-surface-line"
                  aria-sort={sorted ? (sorted === 'asc' ? 'ascending' : 'descending') : undefined}
                >
                  <button
                    type="button"
                    onClick={() => toggleSort(column)}
                    className={cn('inline-flex items-center gap-1 rounded-sm uppercase', focusRing)}
                  >
                    {column.header}
                    <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                  </button>
                </Th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {padTop > 0 && (
            <tr aria-hidden="true" style={{ height: padTop }}>
              <td colSpan={columns.length} />
            </tr>
          )}
          {items.map((item) => {
            const i = rows[item.index];
            const s = source.selection(i);
            const selected = selection?.type === s.type && selection.key === s.key;
            const name = source.name(i);
            return (
              <tr
                key={i}
                data-row={item.index}
                aria-rowindex={item.index + 2}
                aria-selected={selected}
                onClick={() => onSelect(s)}
                className={cn('cursor-pointer hover:bg-surface-sunken', selected && 'bg-accent-soft')}
              >
                {columns.map((column, c) => {
                  const content = column.cell ? column.cell(i) : column.value(i);
                  return c === 0 ? (
                    <Td key={column.id} className="font-mono whitespace-nowrap">
                      <button
                        type="button"
                        className={cn(
                          'rounded-sm text-left font-medium text-accent underline-offset-2 hover:underline',
                          focusRing,
                        )}
                        aria-label={`Select ${s.type} ${name}`}
                        onKeyDown={(e) => onRowKey(e, item.index)}
                      >
                        {content}
                      </button>
                    </Td>
                  ) : (
                    <Td key={column.id} className="max-w-72 truncate whitespace-nowrap">
                      {content}
                    </Td>
                  );
                })}
              </tr>
            );
          })}
          {padBottom > 0 && (
            <tr aria-hidden="true" style={{ height: padBottom }}>
              <td colSpan={columns.length} />
            </tr>
          )}
          {rows.length === 0 && (
            <tr>
              <Td colSpan={columns.length} className="text-text-muted">
                Nothing matches.
              </Td>
            </tr>
          )}
        </tbody>
      </Table>
    </div>
  );
}

const lowerKeysOf = new WeakMap<readonly string[], string[]>();

/** The node keys lower-cased, made when first searched and kept. */
function lowerKeys(keys: readonly string[]): string[] {
  let lower = lowerKeysOf.get(keys);
  if (!lower) lowerKeysOf.set(keys, (lower = keys.map((k) => k.toLowerCase())));
  return lower;
}

const metres = (m: number) => `${formatLength(m, 'm', 2)} · ${formatLength(m, 'ft', 1)}`;

function nodeSource(a: GraphArrays): RowSource {
  const { keys, kinds, positions, labels, edgeFrom, edgeTo } = a;
  const degree = new Uint32Array(keys.length);
  for (let e = 0; e < edgeFrom.length; e++) {
    degree[edgeFrom[e]]++;
    degree[edgeTo[e]]++;
  }
  const axis = (id: string, header: string, k: number): Column => ({
    id,
    header,
    value: (i) => positions[i * 3 + k],
    cell: (i) => positions[i * 3 + k].toFixed(2),
  });
  return {
    caption: 'Nodes',
    count: keys.length,
    kinds: NODE_KINDS,
    kindOf: (i) => kinds[i],
    matches: (i, q) => lowerKeys(keys)[i].includes(q),
    name: (i) => keys[i],
    selection: (i) => ({ type: 'node', key: keys[i] }),
    columns: [
      { id: 'key', header: 'Key', value: (i) => keys[i] },
      { id: 'kind', header: 'Kind', value: (i) => NODE_KINDS[kinds[i]] },
      { id: 'label', header: 'Label', value: (i) => labels[i] ?? '' },
      axis('x', 'x (m)', 0),
      axis('y', 'y (m)', 1),
      axis('z', 'z (m)', 2),
      { id: 'degree', header: 'Edges', value: (i) => degree[i] },
    ],
  };
}

function edgeSource(a: GraphArrays): RowSource {
  const { keys, edgeFrom, edgeTo, edgeKinds, edgeClosed, edgeIds, edgeLengths, edgeLabels } = a;
  const name = (e: number) => `${keys[edgeFrom[e]]} ↔ ${keys[edgeTo[e]]}`;
  return {
    caption: 'Edges',
    count: edgeFrom.length,
    kinds: EDGE_KINDS,
    kindOf: (e) => edgeKinds[e],
    matches: (e, q) => {
      const lower = lowerKeys(keys);
      const [from, to] = [lower[edgeFrom[e]], lower[edgeTo[e]]];
      if (from.includes(q) || to.includes(q)) return true;
      // a search across the two ends holds part of what stands between them
      return (q.includes(' ') || q.includes('↔')) && `${from} ↔ ${to}`.includes(q);
    },
    name,
    selection: (e) => ({ type: 'edge', key: String(edgeIds[e]) }),
    columns: [
      { id: 'edge', header: 'Edge', value: name },
      { id: 'kind', header: 'Kind', value: (e) => EDGE_KINDS[edgeKinds[e]] },
      { id: 'length', header: 'Length', value: (e) => edgeLengths[e], cell: (e) => metres(edgeLengths[e]) },
      { id: 'closed', header: 'State', value: (e) => (edgeClosed[e] ? 'closed' : 'open') },
      { id: 'label', header: 'Label', value: (e) => edgeLabels[e] ?? '' },
    ],
  };
}

function hazardSource(hazards: readonly Hazard[]): RowSource {
  return {
    caption: 'Hazards',
    count: hazards.length,
    kinds: HAZARD_KINDS,
    kindOf: (i) => HAZARD_KINDS.indexOf(hazards[i].kind),
    matches: (i, q) => hazards[i].key.toLowerCase().includes(q),
    name: (i) => hazards[i].key,
    selection: (i) => ({ type: 'hazard', key: hazards[i].key }),
    columns: [
      { id: 'key', header: 'Key', value: (i) => hazards[i].key },
      { id: 'kind', header: 'Kind', value: (i) => hazards[i].kind },
      { id: 'shape', header: 'Shape', value: (i) => hazards[i].shape },
      {
        id: 'where',
        header: 'Where (m)',
        value: (i) => {
          const h = hazards[i];
          return h.shape === 'sphere'
            ? `centre ${xyz(h.center)}, r ${h.radiusM}`
            : `${xyz(h.min)} to ${xyz(h.max)}`;
        },
      },
      { id: 'label', header: 'Label', value: (i) => hazards[i].label ?? '' },
    ],
  };
}

/**
 * Nodes, edges and hazards as sortable, filterable tables read from the station's columns (a row
 * per index, only the rows in view drawn); a row click selects it on the screen.
 */
export function StationTables({ graph, selection, onSelect }: SelectionViewProps) {
  const [tab, setTab] = useState('nodes');
  const arrays = graphArraysOf(graph);
  const nodes = useMemo(() => nodeSource(arrays), [arrays]);
  const edges = useMemo(() => edgeSource(arrays), [arrays]);
  const hazards = useMemo(() => hazardSource(graph.hazards), [graph.hazards]);
  const table = (source: RowSource) => () => (
    <DataTable source={source} selection={selection} onSelect={onSelect} />
  );
  return (
    <PanelTabs
      label="Station tables"
      active={tab}
      onChange={setTab}
      fill
      tabs={[
        { id: 'nodes', label: `Nodes (${nodes.count})`, render: table(nodes) },
        { id: 'edges', label: `Edges (${edges.count})`, render: table(edges) },
        { id: 'hazards', label: `Hazards (${hazards.count})`, render: table(hazards) },
      ]}
    />
  );
}
