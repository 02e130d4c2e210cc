import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseStationDocument } from '@shared/schemas/station';
import { mergeCsvIntoDocument, parseEdgesCsv, parseNodesCsv } from '@shared/schemas/station-csv';
import { mergeHazardChanges, mergeNodeChanges, mergeStationSettings } from '@shared/schemas/station-edits';
import { buildStationDocument } from '../factories/station-document';

const base = () => {
  const parsed = parseStationDocument(buildStationDocument());
  if (!parsed.ok) throw new Error('factory document must be valid');
  return parsed.doc;
};

describe('station CSV rules', () => {
  it('reads nodes with optional columns in any order', () => {
    const { rows, problems } = parseNodesCsv(
      'z,y,x,kind,key,nx,ny,nz\n3,2,1,socket,S-1,0,0,-1\n\n6,5,4,anchor,A-1,,,\n',
    );
    expect(problems).toEqual([]);
    expect(rows).toEqual([
      { line: 2, value: { key: 'S-1', kind: 'socket', position: [1, 2, 3], normal: [0, 0, -1] } },
      { line: 4, value: { key: 'A-1', kind: 'anchor', position: [4, 5, 6] } },
    ]);
  });

  it('names the line and column of each problem', () => {
    const { problems } = parseNodesCsv(
      'key,kind,x,y,z,nx,ny,nz\nA,anchor,1,2,\nB,anchor,1,2,1e999\nC,anchor,1,2,3,1,,\n',
    );
    expect(problems).toEqual([
      { path: 'nodes.csv line 2, column z', message: 'required' },
      { path: 'nodes.csv line 3, column z', message: 'must be a finite number' },
      { path: 'nodes.csv line 4, column nx', message: 'a normal needs all of nx, ny and nz' },
    ]);
  });

  it('requires the key columns and rejects unknown ones', () => {
    expect(parseEdgesCsv('from,kind\nA,hop\n').problems).toEqual([
      { path: 'edges.csv line 1, column to', message: 'required column is missing' },
    ]);
    expect(parseEdgesCsv('').problems[0].path).toBe('edges.csv line 1');
  });

  it('reads edge lengths and the closed flag', () => {
    const { rows, problems } = parseEdgesCsv(
      'from,to,kind,lengthM,closed\nA,B,hop,2.5,YES\nB,C,ride,,\nC,D,handrail,-1,\nD,E,hop,,maybe\n',
    );
    expect(rows.map((r) => r.value)).toEqual([
      { from: 'A', to: 'B', kind: 'hop', lengthM: 2.5, closed: true },
      { from: 'B', to: 'C', kind: 'ride' },
    ]);
    expect(problems.map((p) => p.path)).toEqual([
      'edges.csv line 4, column lengthM',
      'edges.csv line 5, column closed',
    ]);
  });

  it('merging: nodes are upserted by key and edges by their ends and kind, in either direction', () => {
    const doc = base();
    const n = parseNodesCsv(`key,kind,x,y,z\n${doc.nodes[0].key},junction,9,9,9\nZ-1,anchor,0,0,0\n`);
    const e = parseEdgesCsv(
      `from,to,kind,lengthM\n${doc.edges[0].to},${doc.edges[0].from},${doc.edges[0].kind},7\nZ-1,${doc.nodes[0].key},hop,\n`,
    );
    const merged = mergeCsvIntoDocument(doc, n.rows, e.rows);
    expect(merged.problems).toEqual([]);
    expect(merged.added).toEqual({ nodes: 1, edges: 1 });
    expect(merged.updated).toEqual({ nodes: 1, edges: 1 });
    expect(merged.doc.nodes[0]).toEqual({ key: doc.nodes[0].key, kind: 'junction', position: [9, 9, 9] });
    expect(merged.doc.edges[0].lengthM).toBe(7);
    expect(parseStationDocument(merged.doc).ok).toBe(true);
    expect(doc.nodes[0].position).not.toEqual([9, 9, 9]);
  });

  it('property: any node table written from a document reads back to the same nodes', () => {
    const cell = (v: unknown) =>
      v === undefined ? '' : /[",\n]/.test(String(v)) ? `"${String(v).replace(/"/g, '""')}"` : String(v);
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            kind: fc.constantFrom('junction', 'anchor', 'worksite'),
            position: fc.tuple(
              fc.double({ min: -1e4, max: 1e4, noNaN: true }),
              fc.double({ min: -1e4, max: 1e4, noNaN: true }),
              fc.double({ min: -1e4, max: 1e4, noNaN: true }),
            ),
            label: fc.option(
              fc.string({ minLength: 1, maxLength: 30 }).filter((s) => s.trim() === s && s !== ''),
              { nil: undefined },
            ),
          }),
          { maxLength: 30 },
        ),
        (specs) => {
          const nodes = specs.map((s, i) => ({
            key: `K${i}`,
            kind: s.kind,
            position: s.position.map((v) => v + 0) as [number, number, number],
            ...(s.label ? { label: s.label } : {}),
          }));
          const text = [
            'key,kind,label,x,y,z',
            ...nodes.map((n) => [n.key, n.kind, cell(n.label), ...n.position].join(',')),
          ].join('\n');
          const { rows, problems } = parseNodesCsv(text);
          expect(problems).toEqual([]);
          expect(rows.map((r) => r.value)).toEqual(nodes);
        },
      ),
    );
  });
});

describe('edit merges', () => {
  it('null clears an optional field; the key cannot change', () => {
    const node = {
      key: 'A',
      kind: 'anchor' as const,
      label: 'x',
      position: [0, 0, 0] as [number, number, number],
    };
    expect(mergeNodeChanges(node, { label: null, key: 'B' } as never)).toEqual({
      key: 'A',
      kind: 'anchor',
      position: [0, 0, 0],
    });
  });

  it('changing a hazard shape drops the old shape fields', () => {
    const sphere = {
      key: 'H',
      kind: 'caution' as const,
      shape: 'sphere' as const,
      center: [0, 0, 0] as [number, number, number],
      radiusM: 1,
    };
    expect(mergeHazardChanges(sphere, { shape: 'box', min: [0, 0, 0], max: [1, 1, 1] })).toEqual({
      key: 'H',
      kind: 'caution',
      shape: 'box',
      min: [0, 0, 0],
      max: [1, 1, 1],
    });
  });

  it('settings merge nested objects', () => {
    const settings = base().settings;
    expect(mergeStationSettings(settings, { reach: { radiusM: 0.9 } })).toMatchObject({
      reach: { radiusM: 0.9, standOffM: settings.reach.standOffM },
    });
  });
});
