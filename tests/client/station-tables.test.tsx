import { useState } from 'react';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { act, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { fromGraphColumns, toGraphColumns } from '@shared/compute/graph-columns';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { StationGraph } from '@shared/schemas/station-edits';
import { StationTables } from '@/features/stations/components/station-tables';
import type { StationSelection } from '@/features/stations/components/selection';
import { stationGraphOf } from '../factories/station-graph';

// A generated station of some thousands of nodes, read from columns as the Station screen reads it;
// `plain` is the same graph as objects, what the checks below count against.
const doc = generateTrussStation({ nodes: 3_000, seed: 4 });
const plain = stationGraphOf(doc, 2);
const columnsGraph = () => fromGraphColumns(toGraphColumns(plain));
const nodes = plain.nodes;
const edges = plain.edges;

/** the row height the tables assume until a row is laid out (jsdom lays nothing out) */
const ROW_PX = 41;
const BOX_PX = 410;

// jsdom has no layout: the tables' scroll box (a focusable region) is given a height, its content a
// row's height per row of the table, and it scrolls as a browser's does, so the rows in view are
// those a 410 px box shows
const savedScrollTo = Element.prototype.scrollTo;
const isBox = (el: HTMLElement) => el.getAttribute('role') === 'region';
beforeAll(() => {
  Object.defineProperty(HTMLElement.prototype, 'clientHeight', {
    configurable: true,
    get(this: HTMLElement) {
      return isBox(this) ? BOX_PX : 0;
    },
  });
  Object.defineProperty(HTMLElement.prototype, 'scrollHeight', {
    configurable: true,
    get(this: HTMLElement) {
      const rows = Number(this.querySelector('table')?.getAttribute('aria-rowcount') ?? 0);
      return isBox(this) ? Math.max(BOX_PX, rows * ROW_PX) : 0;
    },
  });
  Element.prototype.scrollTo = function (this: Element, options?: ScrollToOptions | number) {
    if (typeof options === 'object' && options.top !== undefined) this.scrollTop = options.top;
    this.dispatchEvent(new Event('scroll'));
  };
});
afterAll(() => {
  // back to Element's own (nothing laid out)
  delete (HTMLElement.prototype as { clientHeight?: number }).clientHeight;
  delete (HTMLElement.prototype as { scrollHeight?: number }).scrollHeight;
  Element.prototype.scrollTo = savedScrollTo;
});

function Screen({ graph, selected }: { graph: StationGraph; selected: StationSelection[] }) {
  const [selection, setSelection] = useState<StationSelection>(null);
  return (
    <StationTables
      graph={graph}
      selection={selection}
      onSelect={(s) => {
        selected.push(s);
        setSelection(s);
      }}
    />
  );
}

function renderTables(graph = columnsGraph()) {
  const selected: StationSelection[] = [];
  render(<Screen graph={graph} selected={selected} />);
  return { graph, selected };
}

const table = (name: string) => screen.getByRole('table', { name });
/** the table's drawn rows (the spacers above and below the window left out) */
const rowsOf = (name: string) =>
  within(table(name))
    .getAllByRole('row')
    .filter((r) => r.closest('tbody') && r.getAttribute('aria-hidden') !== 'true');
const firstCells = (name: string) => rowsOf(name).map((r) => r.querySelector('td')!.textContent);
const shown = (n: number, of: number) => screen.getByText(`${n} of ${of} shown`);

describe('the station tables read the columns', () => {
  it('draw only the rows in view of a station of thousands, without the graph’s node and edge objects', () => {
    const { graph } = renderTables();
    expect(screen.getByRole('tab', { name: `Nodes (${nodes.length})` })).toBeTruthy();
    expect(screen.getByRole('tab', { name: `Edges (${edges.length})` })).toBeTruthy();
    expect(screen.getByRole('tab', { name: `Hazards (${plain.hazards.length})` })).toBeTruthy();
    expect(shown(nodes.length, nodes.length)).toBeTruthy();
    const drawn = rowsOf('Nodes');
    // the box's rows and the few made beyond it, not thousands
    expect(drawn.length).toBeGreaterThanOrEqual(BOX_PX / ROW_PX);
    expect(drawn.length).toBeLessThan(50);
    expect(firstCells('Nodes').slice(0, 3)).toEqual(nodes.slice(0, 3).map((n) => n.key));
    expect(table('Nodes').getAttribute('aria-rowcount')).toBe(String(nodes.length + 1));
    // the graph's nodes and edges are still made only when first read: the tables did not read them
    expect(Object.getOwnPropertyDescriptor(graph, 'nodes')?.get).toBeTypeOf('function');
    expect(Object.getOwnPropertyDescriptor(graph, 'edges')?.get).toBeTypeOf('function');
  });

  it('bring in the rows scrolled to, each with its place in the whole table', () => {
    renderTables();
    const box = screen.getByRole('region', { name: /Nodes table/ });
    box.scrollTop = ROW_PX * 1_000;
    fireEvent.scroll(box);
    const keys = firstCells('Nodes');
    expect(keys).toContain(nodes[1_000].key);
    expect(keys).not.toContain(nodes[0].key);
    const row = rowsOf('Nodes').find((r) => r.querySelector('td')!.textContent === nodes[1_000].key)!;
    expect(row.getAttribute('aria-rowindex')).toBe('1002');
  });

  it('filter by key and kind, count what they show, and say when nothing matches', async () => {
    const user = userEvent.setup();
    renderTables();
    const q = 's12-';
    const byKey = nodes.filter((n) => n.key.toLowerCase().includes(q));
    await user.type(screen.getByLabelText('Search by key'), q.toUpperCase());
    expect(shown(byKey.length, nodes.length)).toBeTruthy();
    expect(firstCells('Nodes')).toEqual(byKey.slice(0, firstCells('Nodes').length).map((n) => n.key));

    await user.selectOptions(screen.getByLabelText('Kind'), 'anchor');
    const both = byKey.filter((n) => n.kind === 'anchor');
    expect(both.length).toBeGreaterThan(0);
    expect(shown(both.length, nodes.length)).toBeTruthy();
    expect(firstCells('Nodes')).toEqual(both.slice(0, firstCells('Nodes').length).map((n) => n.key));

    await user.type(screen.getByLabelText('Search by key'), 'nothing-like-it');
    expect(shown(0, nodes.length)).toBeTruthy();
    expect(screen.getByText('Nothing matches.')).toBeTruthy();
  });

  it('search edges by either end or across both, and filter them by kind', async () => {
    const user = userEvent.setup();
    renderTables();
    await user.click(screen.getByRole('tab', { name: /^Edges/ }));
    const name = (e: (typeof edges)[number]) => `${e.from} ↔ ${e.to}`;
    const target = edges[700];
    // the end of one key, the arrow and the start of the other
    const across = `${target.from.slice(-2)} ↔ ${target.to.slice(0, 3)}`.toLowerCase();
    const expected = edges.filter((e) => name(e).toLowerCase().includes(across));
    await user.type(screen.getByLabelText('Search by key'), across);
    expect(shown(expected.length, edges.length)).toBeTruthy();
    expect(firstCells('Edges')).toEqual(expected.slice(0, firstCells('Edges').length).map(name));

    await user.clear(screen.getByLabelText('Search by key'));
    await user.selectOptions(screen.getByLabelText('Kind'), 'ride');
    const rides = edges.filter((e) => e.kind === 'ride');
    expect(shown(rides.length, edges.length)).toBeTruthy();
    expect(firstCells('Edges')).toEqual(rides.slice(0, firstCells('Edges').length).map(name));
  });

  it('sort a column on a header’s click: numbers largest first, then smallest, then as given', async () => {
    const user = userEvent.setup();
    renderTables();
    const header = () => screen.getByRole('columnheader', { name: /x \(m\)/ });
    const byX = [...nodes].sort((a, b) => a.position[0] - b.position[0]);
    await user.click(within(header()).getByRole('button'));
    expect(header().getAttribute('aria-sort')).toBe('descending');
    const top = firstCells('Nodes')[0];
    expect(nodes.find((n) => n.key === top)!.position[0]).toBe(byX[byX.length - 1].position[0]);
    await user.click(within(header()).getByRole('button'));
    expect(header().getAttribute('aria-sort')).toBe('ascending');
    expect(nodes.find((n) => n.key === firstCells('Nodes')[0])!.position[0]).toBe(byX[0].position[0]);
    await user.click(within(header()).getByRole('button'));
    expect(header().getAttribute('aria-sort')).toBeNull();
    expect(firstCells('Nodes')[0]).toBe(nodes[0].key);
  });

  it('sort keys in natural order (S2 before S10), the filter kept', async () => {
    const user = userEvent.setup();
    renderTables();
    await user.selectOptions(screen.getByLabelText('Kind'), 'worksite');
    const keyHeader = () => screen.getByRole('columnheader', { name: /^Key/ });
    await user.click(within(keyHeader()).getByRole('button'));
    expect(keyHeader().getAttribute('aria-sort')).toBe('ascending');
    const natural = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
    const expected = nodes
      .filter((n) => n.kind === 'worksite')
      .map((n) => n.key)
      .sort(natural.compare);
    expect(firstCells('Nodes')).toEqual(expected.slice(0, firstCells('Nodes').length));
    await user.click(within(keyHeader()).getByRole('button'));
    expect(firstCells('Nodes')[0]).toBe(expected[expected.length - 1]);
  });

  it('select a row by a click or the keyboard, highlight it, and move from row to row with the arrows', async () => {
    const user = userEvent.setup();
    const { selected } = renderTables();
    await user.click(screen.getByRole('button', { name: `Select node ${nodes[2].key}` }));
    expect(selected).toEqual([{ type: 'node', key: nodes[2].key }]);
    const row = () => screen.getByRole('button', { name: `Select node ${nodes[2].key}` }).closest('tr')!;
    expect(row().getAttribute('aria-selected')).toBe('true');
    expect(row().className).toContain('bg-accent-soft');

    await user.keyboard('{ArrowDown}');
    expect(document.activeElement).toBe(screen.getByRole('button', { name: `Select node ${nodes[3].key}` }));
    await user.keyboard('{Enter}');
    expect(selected.at(-1)).toEqual({ type: 'node', key: nodes[3].key });
    // End goes to the last row, bringing it into the window first
    await user.keyboard('{End}');
    const last = nodes[nodes.length - 1].key;
    await waitFor(() =>
      expect(document.activeElement).toBe(screen.getByRole('button', { name: `Select node ${last}` })),
    );
    expect(firstCells('Nodes')).not.toContain(nodes[0].key);
    await user.keyboard('{Home}');
    await waitFor(() =>
      expect(document.activeElement).toBe(
        screen.getByRole('button', { name: `Select node ${nodes[0].key}` }),
      ),
    );
    // the scroll box itself is reachable by Tab, so the keys scroll it
    expect(screen.getByRole('region', { name: /Nodes table/ }).tabIndex).toBe(0);
  });

  it('select an edge by its id and list the hazards with their shapes', async () => {
    const user = userEvent.setup();
    const { selected } = renderTables();
    await user.click(screen.getByRole('tab', { name: /^Edges/ }));
    const edge = edges[1];
    await user.click(screen.getByRole('button', { name: `Select edge ${edge.from} ↔ ${edge.to}` }));
    expect(selected.at(-1)).toEqual({ type: 'edge', key: String(edge.id) });

    await user.click(screen.getByRole('tab', { name: /^Hazards/ }));
    expect(firstCells('Hazards')).toEqual(plain.hazards.map((h) => h.key));
    const shapes = rowsOf('Hazards').map((r) => r.querySelectorAll('td')[2].textContent);
    expect(shapes).toEqual(plain.hazards.map((h) => h.shape));
    await user.selectOptions(screen.getByLabelText('Kind'), 'caution');
    const caution = plain.hazards.filter((h) => h.kind === 'caution');
    expect(shown(caution.length, plain.hazards.length)).toBeTruthy();
    await user.click(screen.getByRole('button', { name: `Select hazard ${caution[0].key}` }));
    expect(selected.at(-1)).toEqual({ type: 'hazard', key: caution[0].key });
  });

  it('show a graph made of objects (not read from columns) the same way', () => {
    renderTables(plain);
    expect(shown(nodes.length, nodes.length)).toBeTruthy();
    expect(firstCells('Nodes').slice(0, 3)).toEqual(nodes.slice(0, 3).map((n) => n.key));
    act(() => screen.getByRole('tab', { name: /^Edges/ }).click());
    expect(shown(edges.length, edges.length)).toBeTruthy();
  });
});
