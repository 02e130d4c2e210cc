import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  edgeAt,
  edgeIndexOf,
  edgesAtNode,
  fromGraphColumns,
  graphArraysOf,
  nodeAt,
  toGraphColumns,
  type GraphArrays,
} from '@shared/compute/graph-columns';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { buildStationDocument } from '../factories/station-document';
import { stationGraphOf as graphOf } from '../factories/station-graph';
import { StationDocumentSchema } from '@shared/schemas/station';

const plainArrays = (a: GraphArrays) => ({
  ...a,
  kinds: [...a.kinds],
  positions: [...a.positions],
  normals: a.normals && [...a.normals],
  edgeFrom: [...a.edgeFrom],
  edgeTo: [...a.edgeTo],
  edgeKinds: [...a.edgeKinds],
  edgeClosed: [...a.edgeClosed],
});

describe('graph columns', () => {
  it('read back, through JSON, to the graph they were made from, and to the same typed arrays as its objects', () => {
    const demo = StationDocumentSchema.parse(buildStationDocument());
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), fc.boolean(), (seed, small) => {
        const doc = small ? demo : generateTrussStation({ nodes: 300, seed: seed % 1000 });
        const graph = graphOf(doc, seed);
        const read = fromGraphColumns(JSON.parse(JSON.stringify(toGraphColumns(graph))));
        expect(read).toEqual(graph);
        expect(plainArrays(graphArraysOf(read))).toEqual(plainArrays(graphArraysOf(graph)));
      }),
      { numRuns: 40 },
    );
  });

  it('make one node or edge alone, equal to the graph’s own, and list the edges at each node in order', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), (seed) => {
        const graph = graphOf(generateTrussStation({ nodes: 200, seed: seed % 1000 }), seed);
        const read = fromGraphColumns(toGraphColumns(graph));
        const arrays = graphArraysOf(read);
        // one item is made without the graph's lists (they are still getters)
        expect(nodeAt(read, 1)).toEqual(graph.nodes[1]);
        expect(edgeAt(read, 1)).toEqual(graph.edges[1]);
        expect(Object.getOwnPropertyDescriptor(read, 'nodes')?.get).toBeTypeOf('function');
        expect(Object.getOwnPropertyDescriptor(read, 'edges')?.get).toBeTypeOf('function');
        graph.nodes.forEach((node, i) => {
          expect(nodeAt(read, i)).toEqual(node);
          expect(nodeAt(graph, i)).toBe(node);
          const at = [...edgesAtNode(arrays, i)].map((e) => graph.edges[e]);
          expect(at).toEqual(graph.edges.filter((e) => e.from === node.key || e.to === node.key));
        });
        graph.edges.forEach((edge, e) => {
          expect(edgeAt(read, e)).toEqual(edge);
          expect(edgeIndexOf(arrays, edge.id)).toBe(e);
        });
        expect(edgeIndexOf(arrays, -1)).toBe(-1);
      }),
      { numRuns: 10 },
    );
  });

  it('is smaller than the objects at 10k nodes', () => {
    const graph = graphOf(generateTrussStation({ nodes: 10_000, seed: 3 }), 1);
    expect(JSON.stringify(toGraphColumns(graph)).length).toBeLessThan(JSON.stringify(graph).length / 2);
  });
});
