import { describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { fromGraphColumns, toGraphColumns } from '@shared/compute/graph-columns';
import { pointInHazard, segmentIntersectsHazard } from '@shared/compute/geometry';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { StationGraph } from '@shared/schemas/station-edits';
import { SelectionDetails } from '@/features/stations/components/selection-details';
import { selectionPoints, type StationSelection } from '@/features/stations/components/selection';
import { stationGraphOf } from '../factories/station-graph';

// A generated station read from columns as the Station screen reads it; `plain` is the same graph as
// objects, what the checks count against.
const doc = generateTrussStation({ nodes: 2_000, seed: 6 });
const noted = doc.nodes.find((n) => n.kind === 'socket')!;
noted.notes = 'socket face worn: check before use';
const plain = stationGraphOf(doc, 3);
const at = new Map(plain.nodes.map((n) => [n.key, n.position]));

function show(selection: StationSelection) {
  const graph = fromGraphColumns(toGraphColumns(plain));
  render(<SelectionDetails graph={graph} selection={selection} onSelect={() => {}} />);
  return graph;
}

/** the graph's node and edge lists are still getters: nothing made an object per node or edge */
function untouched(graph: StationGraph) {
  expect(Object.getOwnPropertyDescriptor(graph, 'nodes')?.get).toBeTypeOf('function');
  expect(Object.getOwnPropertyDescriptor(graph, 'edges')?.get).toBeTypeOf('function');
}

describe('the details of a selection read the columns', () => {
  it('show a node’s fields, its edges and notes, without the graph’s node and edge objects', () => {
    const graph = show({ type: 'node', key: noted.key });
    const edges = plain.edges.filter((e) => e.from === noted.key || e.to === noted.key);
    expect(screen.getByText(`Edges (${edges.length})`)).toBeTruthy();
    expect(screen.getByText(noted.notes!)).toBeTruthy();
    expect(screen.getByText(`(${noted.normal!.map((v) => v.toFixed(2)).join(', ')})`)).toBeTruthy();
    for (const e of edges) expect(screen.getByText(e.from === noted.key ? e.to : e.from)).toBeTruthy();
    untouched(graph);
  });

  it('show an edge by its id, its length given or from the positions', () => {
    for (const edge of [plain.edges.find((e) => e.lengthGiven)!, plain.edges.find((e) => !e.lengthGiven)!]) {
      const graph = show({ type: 'edge', key: String(edge.id) });
      expect(screen.getByText(edge.lengthGiven ? '(given)' : '(from the node positions)')).toBeTruthy();
      expect(screen.getByText(edge.from)).toBeTruthy();
      expect(screen.getByText(edge.to)).toBeTruthy();
      untouched(graph);
      cleanup();
    }
  });

  it('count the nodes inside a hazard and the edges through it as the objects do', () => {
    for (const hazard of plain.hazards) {
      const inside = plain.nodes.filter((n) => pointInHazard(n.position, hazard)).length;
      const through = plain.edges.filter((e) =>
        segmentIntersectsHazard(at.get(e.from)!, at.get(e.to)!, hazard),
      ).length;
      expect(inside + through).toBeGreaterThan(0);
      const graph = show({ type: 'hazard', key: hazard.key });
      const row = (label: string) => screen.getByText(label).nextElementSibling!.textContent;
      expect(row('Nodes inside')).toBe(String(inside));
      expect(row('Edges through')).toBe(String(through));
      untouched(graph);
      cleanup();
    }
  });

  it('frame a node with its neighbours and an edge by its ends', () => {
    const graph = fromGraphColumns(toGraphColumns(plain));
    const near = plain.edges
      .filter((e) => e.from === noted.key || e.to === noted.key)
      .map((e) => (e.from === noted.key ? e.to : e.from));
    expect(selectionPoints(graph, { type: 'node', key: noted.key })).toEqual(
      [noted.key, ...near].map((k) => at.get(k)),
    );
    const edge = plain.edges[5];
    expect(selectionPoints(graph, { type: 'edge', key: String(edge.id) })).toEqual([
      at.get(edge.from),
      at.get(edge.to),
    ]);
    expect(selectionPoints(graph, { type: 'node', key: 'NO-SUCH-NODE' })).toEqual([]);
    untouched(graph);
  });
});
