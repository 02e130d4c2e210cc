import { useMemo, useState } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { formatLength } from '@shared/compute/units';
import {
  EDGE_KINDS,
  HAZARD_KINDS,
  NODE_KINDS,
  type Hazard,
  type StationNode,
  type Vec3,
} from '@shared/schemas/station';
import type { GraphEdge } from '@shared/schemas/station-edits';
import { Button, focusRing } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Table, Td, Th } from '@/components/ui/table';
import { cn } from '@/lib/cn';
import { PanelTabs } from '@/components/ui/panel-tabs';
import { edgeKey, type SelectionViewProps, type StationSelection } from './selection';

const PAGE_SIZE = 25;
const xyz = (v: Vec3) => v.map((c) => c.toFixed(2)).join(', ');

interface Row {
  /** what search by key matches */
  searchKey: string;
  kind: string;
  selection: NonNullable<StationSelection>;
}

interface DataTableProps<T extends Row> {
  caption: string;
  rows: T[];
  columns: ColumnDef<T, unknown>[];
  kinds: readonly string[];
  selection: StationSelection;
  onSelect: (s: StationSelection) => void;
}

function DataTable<T extends Row>({ caption, rows, columns, kinds, selection, onSelect }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [search, setSearch] = useState('');
  const [kind, setKind] = useState('');
  const filtered = useMemo(() => {
    const q = search.trim().toLowerCase();
    return rows.filter((r) => (!kind || r.kind === kind) && (!q || r.searchKey.toLowerCase().includes(q)));
  }, [rows, search, kind]);
  // The table object keeps its state behind stable functions, so the React Compiler leaves this
  // component unmemoized; nothing here is memoized by hand on the table either.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: filtered,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: PAGE_SIZE } },
    autoResetPageIndex: true,
  });
  const { pageIndex } = table.getState().pagination;
  const pages = table.getPageCount();

  return (
    <div className="space-y-3">
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
          {filtered.length} of {rows.length} shown
        </p>
      </div>
      <Table caption={caption}>
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <Th
                    key={header.id}
                    aria-sort={sorted ? (sorted === 'asc' ? 'ascending' : 'descending') : undefined}
                  >
                    <button
                      type="button"
                      onClick={header.column.getToggleSortingHandler()}
                      className={cn('inline-flex items-center gap-1 rounded-sm uppercase', focusRing)}
                    >
                      {flexRender(header.column.columnDef.header, header.getContext())}
                      <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                    </button>
                  </Th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => {
            const s = row.original.selection;
            const selected = selection?.type === s.type && selection.key === s.key;
            return (
              <tr
                key={row.id}
                aria-selected={selected}
                onClick={() => onSelect(s)}
                className={cn('cursor-pointer hover:bg-surface-sunken', selected && 'bg-accent-soft')}
              >
                {row.getVisibleCells().map((cell, i) => (
                  <Td key={cell.id} className={i === 0 ? 'font-mono' : undefined}>
                    {i === 0 ? (
                      <button
                        type="button"
                        className={cn(
                          'rounded-sm text-left font-medium text-accent underline-offset-2 hover:underline',
                          focusRing,
                        )}
                        aria-label={`Select ${s.type} ${row.original.searchKey}`}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </button>
                    ) : (
                      flexRender(cell.column.columnDef.cell, cell.getContext())
                    )}
                  </Td>
                ))}
              </tr>
            );
          })}
          {filtered.length === 0 && (
            <tr>
              <Td colSpan={columns.length} className="text-text-muted">
                Nothing matches.
              </Td>
            </tr>
          )}
        </tbody>
      </Table>
      {pages > 1 && (
        <div className="flex items-center justify-end gap-2 text-sm">
          <Button
            size="sm"
            variant="secondary"
            disabled={!table.getCanPreviousPage()}
            onClick={() => table.previousPage()}
          >
            Previous
          </Button>
          <span className="text-text-muted">
            Page {pageIndex + 1} of {pages}
          </span>
          <Button
            size="sm"
            variant="secondary"
            disabled={!table.getCanNextPage()}
            onClick={() => table.nextPage()}
          >
            Next
          </Button>
        </div>
      )}
    </div>
  );
}

type NodeRow = Row & { node: StationNode; degree: number };
type EdgeRow = Row & { edge: GraphEdge };
type HazardRow = Row & { hazard: Hazard };

const nodeColumns: ColumnDef<NodeRow, unknown>[] = [
  { id: 'key', header: 'Key', accessorFn: (r) => r.node.key },
  { id: 'kind', header: 'Kind', accessorFn: (r) => r.node.kind },
  { id: 'label', header: 'Label', accessorFn: (r) => r.node.label ?? '' },
  {
    id: 'x',
    header: 'x (m)',
    accessorFn: (r) => r.node.position[0],
    cell: (c) => (c.getValue() as number).toFixed(2),
  },
  {
    id: 'y',
    header: 'y (m)',
    accessorFn: (r) => r.node.position[1],
    cell: (c) => (c.getValue() as number).toFixed(2),
  },
  {
    id: 'z',
    header: 'z (m)',
    accessorFn: (r) => r.node.position[2],
    cell: (c) => (c.getValue() as number).toFixed(2),
  },
  { id: 'degree', header: 'Edges', accessorFn: (r) => r.degree },
];

const edgeColumns: ColumnDef<EdgeRow, unknown>[] = [
  { id: 'edge', header: 'Edge', accessorFn: (r) => r.searchKey },
  { id: 'kind', header: 'Kind', accessorFn: (r) => r.edge.kind },
  {
    id: 'length',
    header: 'Length',
    accessorFn: (r) => r.edge.lengthM,
    cell: (c) =>
      `${formatLength(c.getValue() as number, 'm', 2)} · ${formatLength(c.getValue() as number, 'ft', 1)}`,
  },
  { id: 'closed', header: 'State', accessorFn: (r) => (r.edge.closed ? 'closed' : 'open') },
  { id: 'label', header: 'Label', accessorFn: (r) => r.edge.label ?? '' },
];

const hazardColumns: ColumnDef<HazardRow, unknown>[] = [
  { id: 'key', header: 'Key', accessorFn: (r) => r.hazard.key },
  { id: 'kind', header: 'Kind', accessorFn: (r) => r.hazard.kind },
  { id: 'shape', header: 'Shape', accessorFn: (r) => r.hazard.shape },
  {
    id: 'where',
    header: 'Where (m)',
    accessorFn: (r) =>
      r.hazard.shape === 'sphere'
        ? `centre ${xyz(r.hazard.center)}, r ${r.hazard.radiusM}`
        : `${xyz(r.hazard.min)} to ${xyz(r.hazard.max)}`,
  },
  { id: 'label', header: 'Label', accessorFn: (r) => r.hazard.label ?? '' },
];

/** Nodes, edges and hazards as sortable, filterable tables; a row click selects it on the screen. */
export function StationTables({ graph, selection, onSelect }: SelectionViewProps) {
  const [tab, setTab] = useState('nodes');
  const nodeRows = useMemo<NodeRow[]>(() => {
    const degree = new Map<string, number>();
    for (const e of graph.edges) {
      degree.set(e.from, (degree.get(e.from) ?? 0) + 1);
      degree.set(e.to, (degree.get(e.to) ?? 0) + 1);
    }
    return graph.nodes.map((node) => ({
      node,
      degree: degree.get(node.key) ?? 0,
      searchKey: node.key,
      kind: node.kind,
      selection: { type: 'node', key: node.key },
    }));
  }, [graph]);
  const edgeRows = useMemo<EdgeRow[]>(
    () =>
      graph.edges.map((edge) => ({
        edge,
        searchKey: `${edge.from} ↔ ${edge.to}`,
        kind: edge.kind,
        selection: { type: 'edge', key: edgeKey(edge) },
      })),
    [graph],
  );
  const hazardRows = useMemo<HazardRow[]>(
    () =>
      graph.hazards.map((hazard) => ({
        hazard,
        searchKey: hazard.key,
        kind: hazard.kind,
        selection: { type: 'hazard', key: hazard.key },
      })),
    [graph],
  );

  return (
    <PanelTabs
      label="Station tables"
      active={tab}
      onChange={setTab}
      tabs={[
        {
          id: 'nodes',
          label: `Nodes (${graph.nodes.length})`,
          render: () => (
            <DataTable
              caption="Nodes"
              rows={nodeRows}
              columns={nodeColumns}
              kinds={NODE_KINDS}
              selection={selection}
              onSelect={onSelect}
            />
          ),
        },
        {
          id: 'edges',
          label: `Edges (${graph.edges.length})`,
          render: () => (
            <DataTable
              caption="Edges"
              rows={edgeRows}
              columns={edgeColumns}
              kinds={EDGE_KINDS}
              selection={selection}
              onSelect={onSelect}
            />
          ),
        },
        {
          id: 'hazards',
          label: `Hazards (${graph.hazards.length})`,
          render: () => (
            <DataTable
              caption="Hazards"
              rows={hazardRows}
              columns={hazardColumns}
              kinds={HAZARD_KINDS}
              selection={selection}
              onSelect={onSelect}
            />
          ),
        },
      ]}
    />
  );
}
