import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyStationChange, edgeId, type StationChange } from '@shared/compute/station-changes';
import { applyValidChange, changeProblems, changeProblemsFull } from '@shared/compute/station-validation';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';
import { buildStationDocument } from '../factories/station-document';

const start = StationDocumentSchema.parse(buildStationDocument());
const NEW_KEYS = ['N1', 'N2', 'N3'];

/**
 * One edit of the kinds the editor makes (move, add, remove, note, kind, edge add/remove/close,
 * hazard, segment, arms, name), drawn over the document's own keys and a few new ones, valid or not:
 * non-finite or out-of-range numbers, unknown ends, self-loops, twins, duplicate keys, a socket
 * without a normal, an arm on an unknown base. Also what bulk writes and the graph rules' corners
 * make: a node renamed in place, a node deleted with its edges, taken out and put back in one
 * change, two nodes added at once, an edge given new ends, the node list reordered, a segment or
 * hazard under a key already used.
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
    fc
      .record({ n: node, key: anyKey })
      .map(({ n, key }) => (n ? { nodes: { replaced: [{ id: n.key, item: { ...n, key } }] } } : {})),
    node.map((n) =>
      n
        ? {
            nodes: { removed: [n.key] },
            edges: { removed: doc.edges.filter((e) => e.from === n.key || e.to === n.key).map(edgeId) },
          }
        : {},
    ),
    node.map((n) => (n ? { nodes: { removed: [n.key], added: [{ ...n }] } } : {})),
    fc.record({ a: anyKey, b: anyKey, p: vec }).map(({ a, b, p }) => ({
      nodes: {
        added: [
          { key: a, kind: 'anchor' as const, position: p },
          { key: b, kind: 'junction' as const, position: p },
        ],
      },
    })),
    fc
      .record({ e: edge, from: anyKey, to: anyKey })
      .map(({ e, from, to }) =>
        e ? { edges: { replaced: [{ id: edgeId(e), item: { ...e, from, to } }] } } : {},
      ),
    fc.constant({ nodes: { all: [...doc.nodes].reverse() } }),
    fc
      .record({
        s: fc.constantFrom(...doc.segments),
        key: fc.constantFrom('NEW', ...doc.segments.map((x) => x.key)),
      })
      .map(({ s, key }) => ({ segments: { added: [{ ...s, key }] } })),
    fc.constantFrom(...doc.hazards.map((h) => h.key), 'H2').map((key) => ({
      hazards: {
        added: [{ key, kind: 'caution' as const, shape: 'box' as const, min: [0, 0, 0], max: [1, 1, 1] }],
      },
    })),
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
            // every third valid edit is applied as a write that checks nothing (a deletion does)
            // would: the next checked edit then starts from the index that write carried over
            if (full.length === 0 && i % 3 === 2) {
              const next = applyValidChange(doc, change);
              expect(next).toEqual(applyStationChange(doc, change));
              doc = next;
              continue;
            }
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
