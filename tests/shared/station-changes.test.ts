import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  applyStationChange,
  diffStationDocuments,
  edgeId,
  emptyStationDocument,
  isEmptyChange,
  replayStationChanges,
  summarizeStationChange,
} from '@shared/compute/station-changes';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';
import { buildStationDocument } from '../factories/station-document';

const base = StationDocumentSchema.parse(buildStationDocument());
const KEYS = ['A', 'B', 'C', 'D', 'E', 'F'];

/** Random small documents over a few keys: nodes, edges between them, hazards, segments, settings. */
const docArb: fc.Arbitrary<StationDocument> = fc
  .record({
    name: fc.constantFrom('Kite', 'Heron', 'Wren'),
    beta: fc.integer({ min: -60, max: 60 }),
    tether: fc.constantFrom(12, 25.9),
    nodes: fc.shuffledSubarray(KEYS),
    xs: fc.array(fc.integer({ min: -5, max: 5 }), { minLength: KEYS.length, maxLength: KEYS.length }),
    labels: fc.array(fc.option(fc.constantFrom('rail', 'post'), { nil: undefined }), {
      minLength: KEYS.length,
      maxLength: KEYS.length,
    }),
    edges: fc.array(
      fc.record({
        a: fc.constantFrom(...KEYS),
        b: fc.constantFrom(...KEYS),
        kind: fc.constantFrom('handrail' as const, 'hop' as const),
        closed: fc.boolean(),
      }),
      { maxLength: 8 },
    ),
    hazards: fc.shuffledSubarray(['H1', 'H2', 'H3']),
    radius: fc.integer({ min: 1, max: 3 }),
    segments: fc.shuffledSubarray(['S1', 'S2']),
  })
  .map((r) => {
    const nodes = r.nodes.map((key) => {
      const i = KEYS.indexOf(key);
      return {
        key,
        kind: 'junction' as const,
        position: [r.xs[i], 0, 0] as [number, number, number],
        ...(r.labels[i] ? { label: r.labels[i] } : {}),
      };
    });
    const seen = new Set<string>();
    const edges = r.edges
      .filter((e) => e.a !== e.b && r.nodes.includes(e.a) && r.nodes.includes(e.b))
      .map((e) => ({ from: e.a, to: e.b, kind: e.kind, ...(e.closed ? { closed: true } : {}) }))
      .filter((e) => !seen.has(edgeId(e)) && seen.add(edgeId(e)));
    return {
      ...base,
      name: r.name,
      orbit: { altitudeKm: 410, betaDeg: r.beta },
      settings: { ...base.settings, tetherLengthM: r.tether },
      nodes,
      edges,
      hazards: r.hazards.map((key) => ({
        key,
        kind: 'caution' as const,
        shape: 'sphere' as const,
        center: [0, 0, 0] as [number, number, number],
        radiusM: r.radius,
      })),
      segments: r.segments.map((key) => ({
        key,
        kind: 'truss' as const,
        center: [0, 0, 0] as [number, number, number],
        size: [1, 1, 1] as [number, number, number],
      })),
    };
  });

describe('station changes (worked by hand and by property)', () => {
  it('applying the difference of two documents to the first gives the second exactly', () => {
    fc.assert(
      fc.property(docArb, docArb, (a, b) => {
        expect(applyStationChange(a, diffStationDocuments(a, b))).toEqual(b);
      }),
      { numRuns: 300 },
    );
  });

  it('a document differs from itself in nothing, and a change leaves its input untouched', () => {
    fc.assert(
      fc.property(docArb, docArb, (a, b) => {
        expect(isEmptyChange(diffStationDocuments(a, a))).toBe(true);
        const before = structuredClone(a);
        applyStationChange(a, diffStationDocuments(a, b));
        expect(a).toEqual(before);
      }),
    );
  });

  it('replaying the changes of a history from the empty station rebuilds every version', () => {
    fc.assert(
      fc.property(fc.array(docArb, { minLength: 1, maxLength: 6 }), (versions) => {
        const changes = versions.map((v, i) =>
          diffStationDocuments(i ? versions[i - 1] : emptyStationDocument(), v),
        );
        versions.forEach((v, i) => expect(replayStationChanges(changes.slice(0, i + 1))).toEqual(v));
      }),
      { numRuns: 100 },
    );
  });

  it('names one edit by what it touches: a node moved is one changed node, in place', () => {
    const moved = structuredClone(base);
    moved.nodes[2] = { ...moved.nodes[2], position: [5, 0.5, 1.5] };
    const change = diffStationDocuments(base, moved);
    expect(change).toEqual({ nodes: { changed: [moved.nodes[2]] } });
    expect(summarizeStationChange(change)).toEqual(['1 node changed']);
  });

  it('an edge given new ends can be replaced in place; an unknown identity is refused', () => {
    const e = base.edges[1];
    const next = applyStationChange(base, {
      edges: { replaced: [{ id: edgeId(e), item: { ...e, to: 'T1-A02' } }] },
    });
    expect(next.edges[1]).toEqual({ ...e, to: 'T1-A02' });
    expect(next.edges).toHaveLength(base.edges.length);
    expect(() =>
      applyStationChange(base, { nodes: { changed: [{ ...base.nodes[0], key: 'NOPE' }] } }),
    ).toThrow(/NOPE/);
  });

  it('a reordered list is kept whole, so the order comes back too', () => {
    const reordered = { ...base, nodes: [...base.nodes].reverse() };
    const change = diffStationDocuments(base, reordered);
    expect(change.nodes?.all).toHaveLength(base.nodes.length);
    expect(applyStationChange(base, change)).toEqual(reordered);
  });
});
