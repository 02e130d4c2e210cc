import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyStationChange, type StationChange } from '@shared/compute/station-changes';
import { changeProblems, changeProblemsFull } from '@shared/compute/station-validation';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';
import { buildStationDocument } from '../factories/station-document';

const start = StationDocumentSchema.parse(buildStationDocument());
const NEW_KEYS = ['N1', 'N2', 'N3'];

/**
 * One edit of the kinds the editor makes (move, add, remove, note, kind, edge add/remove/close,
 * hazard, segment, arms, name), drawn over the document's own keys and a few new ones, valid or not:
 * non-finite or out-of-range numbers, unknown ends, self-loops, twins, duplicate keys, a socket
 * without a normal, an arm on an unknown base.
 */
function editArb(doc: StationDocument): fc.Arbitrary<StationChange> {
  const keys = doc.nodes.map((n) => n.key);
  const anyKey = fc.constantFrom(...keys, ...NEW_KEYS);
  const num = fc.oneof(fc.integer({ min: -20, max: 20 }), fc.constantFrom(Number.NaN, Infinity, -1));
  const vec = fc.tuple(num, num, num);
  const node = doc.nodes.length ? fc.constantFrom(...doc.nodes) : fc.constant(undefined);
  const edge = doc.edges.length ? fc.constantFrom(...doc.edges) : fc.constant(undefined);
  const kind = fc.constantFrom('junction', 'anchor', 'socket', 'worksite', 'airlock' as const);
  return fc.oneof(
    fc
      .record({ n: node, p: vec })
      .map(({ n, p }) => (n ? { nodes: { changed: [{ ...n, position: p }] } } : {})),
    fc
      .record({ n: node, notes: fc.string({ maxLength: 5 }) })
      .map(({ n, notes }) => (n ? { nodes: { changed: [{ ...n, notes }] } } : {})),
    fc.record({ n: node, k: kind }).map(({ n, k }) => (n ? { nodes: { changed: [{ ...n, kind: k }] } } : {})),
    fc.record({ key: anyKey, k: kind, p: vec, normal: fc.boolean() }).map(({ key, k, p, normal }) => ({
      nodes: { added: [{ key, kind: k, position: p, ...(normal ? { normal: [0, 0, 1] } : {}) }] },
    })),
    node.map((n) => (n ? { nodes: { removed: [n.key] } } : {})),
    fc
      .record({
        from: anyKey,
        to: anyKey,
        k: fc.constantFrom('handrail', 'hop' as const),
        len: fc.option(num),
      })
      .map(({ from, to, k, len }) => ({
        edges: { added: [{ from, to, kind: k, ...(len === null ? {} : { lengthM: len }) }] },
      })),
    edge.map((e) => (e ? { edges: { removed: [[e.from, e.to].sort().join('|') + `|${e.kind}`] } } : {})),
    edge.map((e) => (e ? { edges: { changed: [{ ...e, closed: !e.closed }] } } : {})),
    fc.record({ key: fc.constantFrom('H1', 'H9'), r: num }).map(({ key, r }) => ({
      hazards: {
        added: [{ key, kind: 'keep-out' as const, shape: 'sphere' as const, center: [0, 0, 0], radiusM: r }],
      },
    })),
    fc.record({ s: fc.constantFrom(...doc.segments), c: vec }).map(({ s, c }) => ({
      segments: { changed: [{ ...s, center: c }] },
    })),
    fc.record({ base: anyKey, reach: num }).map(({ base, reach }) => ({
      arms: { all: [{ key: 'ARM-1', baseNode: base, reachM: reach, tipSpeedMps: 0.05, settleSeconds: 60 }] },
    })),
    fc.constantFrom('', 'Renamed').map((name) => ({ name })),
  ) as fc.Arbitrary<StationChange>;
}

const bySet = (problems: { path: string; message: string }[]) =>
  problems.map((p) => `${p.path}: ${p.message}`).sort();

describe('incremental station validation', () => {
  it('finds exactly the problems the full check finds, edit after edit (a refused edit leaves the station as it was)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 2 ** 31 - 1 }),
        fc.integer({ min: 5, max: 30 }),
        (seed, steps) => {
          let doc = start;
          const rnd = fc.sample(fc.integer(), { seed, numRuns: steps });
          for (let i = 0; i < steps; i++) {
            const [change] = fc.sample(editArb(doc), { seed: rnd[i], numRuns: 1 });
            const full = changeProblemsFull(doc, change);
            const incremental = changeProblems(doc, change);
            expect(bySet(incremental.problems)).toEqual(bySet(full));
            expect(incremental.doc).toEqual(applyStationChange(doc, change));
            if (full.length === 0) doc = incremental.doc;
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('leaves the document it starts from untouched and shares what the change leaves alone', () => {
    const doc = StationDocumentSchema.parse(generateTrussStation({ nodes: 200, seed: 1 }));
    const copy = structuredClone(doc);
    const moved = { ...doc.nodes[3], position: [1, 2, 3] as [number, number, number] };
    const { doc: after, problems } = changeProblems(doc, { nodes: { changed: [moved] } });
    expect(problems).toEqual([]);
    expect(doc).toEqual(copy);
    expect(after.nodes[3]).toEqual(moved);
    expect(after.nodes[3]).not.toBe(moved);
    expect(after.nodes[4]).toBe(doc.nodes[4]);
    expect(after.edges).toBe(doc.edges);
  });
});
