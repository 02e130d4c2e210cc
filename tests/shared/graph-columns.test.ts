import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  fromGraphColumns,
  graphArraysOf,
  toGraphColumns,
  type GraphArrays,
} from '@shared/compute/graph-columns';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';
import { buildStationDocument } from '../factories/station-document';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';

/** A graph as the graph endpoint answers it: ids rising with gaps, some lengths given, some edges closed or labelled. */
function graphOf(doc: StationDocument, seed: number): StationGraph {
  let s = seed;
  const next = () => (s = (s * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
  const at = new Map(doc.nodes.map((n) => [n.key, n.position]));
  let id = Math.floor(next() * 50);
  const edges: GraphEdge[] = doc.edges.map((e) => {
    id += 1 + Math.floor(next() * 3);
    const [a, b] = [at.get(e.from)!, at.get(e.to)!];
    const given = e.lengthM ?? (next() < 0.1 ? Math.round(next() * 1000) / 97 : undefined);
    const label = e.label ?? (next() < 0.05 ? `rail ${id}` : undefined);
    return {
      id,
      from: e.from,
      to: e.to,
      kind: e.kind,
      lengthM: given ?? Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]),
      lengthGiven: given !== undefined,
      closed: e.closed ?? next() < 0.05,
      ...(label === undefined ? {} : { label }),
    };
  });
  return {
    station: {
      id: 7,
      name: doc.name,
      version: 3,
      orbit: doc.orbit,
      settings: doc.settings,
      counts: {
        nodes: doc.nodes.length,
        edges: doc.edges.length,
        hazards: doc.hazards.length,
        segments: doc.segments.length,
      },
      createdAt: '2026-12-05T10:00:00.000Z',
      updatedAt: '2026-12-05T11:00:00.000Z',
      updatedBy: null,
    },
    segments: doc.segments,
    nodes: doc.nodes,
    edges,
    hazards: doc.hazards,
    arms: doc.arms,
  } as StationGraph;
}

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
