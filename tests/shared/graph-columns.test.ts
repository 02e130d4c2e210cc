import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  fromGraphColumns,
  graphArraysOf,
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

  it('is smaller than the objects at 10k nodes', () => {
    const graph = graphOf(generateTrussStation({ nodes: 10_000, seed: 3 }), 1);
    expect(JSON.stringify(toGraphColumns(graph)).length).toBeLessThan(JSON.stringify(graph).length / 2);
  });
});
