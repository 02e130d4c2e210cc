import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildStationDocument, FIXTURE_KEYS, stationDocumentFile } from '../factories/station-document';
import { postStationDocument } from '../setup/stations';
import { makeTestAppAs, type TestAgent, type TestApp } from '../setup/test-app';
import { STATION_FILE_MAX_BYTES } from '../../server/modules/stations/stations.router';

let t: TestApp;
let engineer: TestAgent;

beforeAll(async () => {
  ({ t, agent: engineer } = await makeTestAppAs('engineer'));
});
afterAll(() => t.close());

/** A tiny valid PNG (1×1, transparent): its signature is what a content check looks at. */
const PNG_1X1 = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);

async function stationCount() {
  return (await engineer.get('/api/stations')).body.length as number;
}

async function expectRefused(bytes: Buffer, status: number, expectedPath?: string) {
  const before = await stationCount();
  const res = await postStationDocument(engineer, bytes);
  expect(res.status).toBe(status);
  expect(res.body.error).toBeDefined();
  expect(res.body.error.message).not.toMatch(/at .*\.ts:\d+/);
  if (expectedPath)
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(expectedPath);
  expect(await stationCount()).toBe(before);
  return res.body.error as { code: string; message: string; details?: { path: string; message: string }[] };
}

const doc = buildStationDocument;
const withNode = (i: number, patch: object) => {
  const d = doc();
  d.nodes[i] = { ...d.nodes[i], ...patch } as (typeof d.nodes)[number];
  return d;
};

describe('bad station documents: 400 naming the problem, nothing written', () => {
  it('not JSON', async () => {
    const error = await expectRefused(Buffer.from('{"format": "tetherwise.station", "nodes": [,]}'), 400);
    expect(error.code).toBe('VALIDATION_FAILED');
    expect(error.message).toMatch(/^The file is not valid JSON: /);
    expect(error.details![0].path).toMatch(/^\(document\)/);
    expect(error.details![0].message).toMatch(/Unexpected token/);
  });

  it('wrong format', async () => {
    const error = await expectRefused(
      stationDocumentFile({ ...doc(), format: 'something.else' }),
      400,
      'format',
    );
    expect(error.details).toHaveLength(1);
  });

  it('missing nodes', async () => {
    const { nodes: _n, ...rest } = doc();
    await expectRefused(stationDocumentFile(rest), 400, 'nodes');
  });

  it('an edge naming an unknown key', async () => {
    const d = doc();
    d.edges.push({ from: FIXTURE_KEYS.airlock, to: 'NO-SUCH-NODE', kind: 'handrail' });
    const error = await expectRefused(stationDocumentFile(d), 400, `edges[${d.edges.length - 1}].to`);
    expect(error.details![0].message).toContain('NO-SUCH-NODE');
  });

  it('a duplicate key', async () => {
    const d = doc();
    d.nodes.push({ key: FIXTURE_KEYS.junction, kind: 'anchor', position: [1, 1, 1] });
    await expectRefused(stationDocumentFile(d), 400, `nodes[${d.nodes.length - 1}].key`);
  });

  it('a non-finite number (1e999 parses to Infinity) and a number sent as a string', async () => {
    const text = JSON.stringify(doc()).replace('"position":[2,0,1.5]', '"position":[2,1e999,1.5]');
    expect(text).toContain('1e999');
    const error = await expectRefused(Buffer.from(text), 400, 'nodes[1].position[1]');
    expect(error.details!.find((d) => d.path === 'nodes[1].position[1]')!.message).toBe(
      'must be a finite number',
    );
    await expectRefused(
      stationDocumentFile(withNode(2, { position: [5, '0', 1.5] })),
      400,
      'nodes[2].position[1]',
    );
  });

  it('a negative length', async () => {
    const d = doc();
    d.edges[0] = { ...d.edges[0], lengthM: -2 };
    await expectRefused(stationDocumentFile(d), 400, 'edges[0].lengthM');
  });

  it('a socket without a normal, and a normal that is not of unit length', async () => {
    const socketIndex = doc().nodes.findIndex((n) => n.kind === 'socket');
    const { normal: _drop, ...bare } = doc().nodes[socketIndex] as { normal?: unknown };
    const d = doc();
    d.nodes[socketIndex] = bare as (typeof d.nodes)[number];
    const missing = await expectRefused(stationDocumentFile(d), 400, `nodes[${socketIndex}].normal`);
    expect(missing.details![0].message).toContain('unit normal');
    const long = await expectRefused(
      stationDocumentFile(withNode(socketIndex, { normal: [0, 2, 0] })),
      400,
      `nodes[${socketIndex}].normal`,
    );
    expect(long.details![0].message).toContain('2.0000');
  });

  it('an unknown kind', async () => {
    await expectRefused(stationDocumentFile(withNode(0, { kind: 'hatch' })), 400, 'nodes[0].kind');
  });

  it('a hazard box whose min is not below its max', async () => {
    const d = doc();
    const i = d.hazards!.findIndex((h) => h.shape === 'box');
    d.hazards![i] = { ...d.hazards![i], min: [0, 0, 0], max: [1, 0, 1] } as NonNullable<
      typeof d.hazards
    >[number];
    await expectRefused(stationDocumentFile(d), 400, `hazards[${i}].max[1]`);
  });

  it('reports every problem, not only the first', async () => {
    const d = withNode(0, { kind: 'hatch' });
    d.edges[1] = { ...d.edges[1], lengthM: -1 };
    const error = await expectRefused(stationDocumentFile(d), 400);
    expect(error.details!.map((x) => x.path)).toEqual(
      expect.arrayContaining(['nodes[0].kind', 'edges[1].lengthM']),
    );
  });

  it('names schema problems, duplicate keys and dangling edges together in one answer', async () => {
    const d = withNode(0, { kind: 'hatch' });
    d.nodes[2] = { ...d.nodes[2], key: d.nodes[1].key };
    d.edges[3] = { ...d.edges[3], to: 'NO-SUCH-NODE' };
    const error = await expectRefused(stationDocumentFile(d), 400);
    const paths = error.details!.map((x) => x.path);
    expect(paths).toEqual(expect.arrayContaining(['nodes[0].kind', 'nodes[2].key', 'edges[3].to']));
    expect(error.details!.find((x) => x.path === 'nodes[2].key')!.message).toContain('duplicate node key');
    expect(error.details!.find((x) => x.path === 'edges[3].to')!.message).toContain('NO-SUCH-NODE');
  });
});

describe('files that are not station documents', () => {
  it('a PNG sent as the document is refused as unsupported media (415)', async () => {
    const error = await expectRefused(PNG_1X1, 415);
    expect(error.code).toBe('UNSUPPORTED_MEDIA_TYPE');
    expect(error.message).toContain('image/png');
  });

  it('other binary content is refused (415)', async () => {
    await expectRefused(Buffer.from([0x7b, 0x00, 0x01, 0x02, 0x7d]), 415);
  });

  it('over the size cap: 413', async () => {
    const big = Buffer.alloc(STATION_FILE_MAX_BYTES + 1024, 0x20);
    const error = await expectRefused(big, 413);
    expect(error.code).toBe('PAYLOAD_TOO_LARGE');
  });
});
