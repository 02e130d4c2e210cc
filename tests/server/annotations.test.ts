import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ATTACHMENT_MAX_BYTES } from '../../server/modules/annotations/annotations.router';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';

/** A 1×1 PNG and the smallest JPEG header that says what it is and its size: real magic bytes, not names. */
const PNG_1X1 = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);
function jpegStart(width: number, height: number) {
  const sof = Buffer.from([0xff, 0xc0, 0x00, 0x11, 0x08, 0, 0, 0, 0, 0x03, ...Buffer.alloc(9)]);
  sof.writeUInt16BE(height, 5);
  sof.writeUInt16BE(width, 7);
  return Buffer.concat([
    Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10]),
    Buffer.from('JFIF\0'),
    Buffer.alloc(9),
    sof,
    Buffer.alloc(64),
  ]);
}
const JPEG_START = jpegStart(640, 480);

let t: TestApp;
let trainer: TestAgent;
let stationId: number;

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation());
  trainer = await t.agent('trainer');
});
afterAll(() => t.close());

async function createNote(body: object, agent = trainer) {
  return agent.post(`/api/stations/${stationId}/annotations`).send(body);
}

describe('annotations', () => {
  it('a note on a node takes the node position; a note on a point keeps its own', async () => {
    const onNode = await createNote({
      nodeKey: K.socket,
      title: 'Check socket',
      body: 'Socket looks worn in the last survey photo.',
    });
    expect(onNode.status).toBe(201);
    const socket = buildStationDocument().nodes.find((n) => n.key === K.socket)!;
    expect(onNode.body).toMatchObject({
      nodeKey: K.socket,
      position: socket.position,
      title: 'Check socket',
      status: 'open',
      author: { name: 'Jonah Abara' },
      replies: [],
      attachments: [],
    });

    const onPoint = await createNote({ position: [1.25, -2, 3.5], title: 'Sharp edge here' });
    expect(onPoint.status).toBe(201);
    expect(onPoint.body).toMatchObject({ nodeKey: null, position: [1.25, -2, 3.5], body: '' });

    const list = await (await t.agent('viewer')).get(`/api/stations/${stationId}/annotations`);
    expect(list.status).toBe(200);
    expect(list.body.map((a: { id: number }) => a.id)).toEqual([onPoint.body.id, onNode.body.id]);
  });

  it('refuses both or neither pin, and an unknown node', async () => {
    expect((await createNote({ title: 'nowhere' })).status).toBe(400);
    expect((await createNote({ nodeKey: K.socket, position: [0, 0, 0], title: 'both' })).status).toBe(400);
    const unknown = await createNote({ nodeKey: 'GHOST', title: 'ghost' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0].path).toBe('body.nodeKey');
    expect((await (await t.agent('engineer')).get('/api/stations/999/annotations')).status).toBe(404);
  });

  it('reply, resolve and reopen', async () => {
    const note = (await createNote({ nodeKey: K.worksite, title: 'Pump bolts' })).body;
    const planner = await t.agent('planner');
    const replied = await planner
      .post(`/api/annotations/${note.id}/replies`)
      .send({ body: 'Torque values are in the task card.' });
    expect(replied.status).toBe(201);
    expect(replied.body.replies).toEqual([
      expect.objectContaining({
        body: 'Torque values are in the task card.',
        author: { id: expect.any(Number), name: 'Priya Lindqvist' },
      }),
    ]);

    const resolved = await planner.patch(`/api/annotations/${note.id}`).send({ status: 'resolved' });
    expect(resolved.body).toMatchObject({ status: 'resolved', resolvedBy: { name: 'Priya Lindqvist' } });
    expect(
      (await trainer.get(`/api/stations/${stationId}/annotations?status=open`)).body.some(
        (a: { id: number }) => a.id === note.id,
      ),
    ).toBe(false);
    const reopened = await trainer.patch(`/api/annotations/${note.id}`).send({ status: 'open' });
    expect(reopened.body).toMatchObject({ status: 'open', resolvedBy: null });

    // rewording is for the author (or an admin)
    expect((await planner.patch(`/api/annotations/${note.id}`).send({ title: 'Hijacked' })).status).toBe(403);
    expect(
      (await trainer.patch(`/api/annotations/${note.id}`).send({ title: 'Pump bolts (4)' })).body.title,
    ).toBe('Pump bolts (4)');
    expect((await trainer.patch(`/api/annotations/${note.id}`).send({})).status).toBe(400);
  });

  it('a viewer can read but not write', async () => {
    const viewer = await t.agent('viewer');
    const note = (await createNote({ position: [0, 0, 0], title: 'Read me' })).body;
    expect((await viewer.get(`/api/annotations/${note.id}`)).status).toBe(200);
    expect(
      (await viewer.post(`/api/stations/${stationId}/annotations`).send({ position: [0, 0, 0], title: 'x' }))
        .status,
    ).toBe(403);
    expect((await viewer.post(`/api/annotations/${note.id}/replies`).send({ body: 'x' })).status).toBe(403);
    expect((await viewer.patch(`/api/annotations/${note.id}`).send({ status: 'resolved' })).status).toBe(403);
    expect(
      (await viewer.post(`/api/annotations/${note.id}/attachments`).attach('file', PNG_1X1, 'a.png')).status,
    ).toBe(403);
    expect((await t.anonymous().get(`/api/stations/${stationId}/annotations`)).status).toBe(401);
  });
});

describe('image attachments', () => {
  it('a PNG is stored under a random name and served only to signed-in users, with nosniff', async () => {
    const note = (await createNote({ position: [0, 0, 0], title: 'Photo' })).body;
    const up = await trainer
      .post(`/api/annotations/${note.id}/attachments`)
      .attach('file', PNG_1X1, '../../etc/"evil"\r\nname.png');
    expect(up.status).toBe(201);
    const att = up.body.attachment;
    expect(att).toMatchObject({
      mimeType: 'image/png',
      sizeBytes: PNG_1X1.length,
      url: `/api/attachments/${att.id}`,
    });
    expect(att.fileName).not.toMatch(/[/\\"\r\n]/);

    const stored = fs.readdirSync(path.join(t.dir, 'uploads'));
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatch(/^[a-f0-9]{32}\.png$/);

    const viewer = await t.agent('viewer');
    const got = await viewer.get(att.url).buffer(true);
    expect(got.status).toBe(200);
    expect(got.headers['content-type']).toBe('image/png');
    expect(got.headers['x-content-type-options']).toBe('nosniff');
    expect(got.headers['content-disposition']).toMatch(/^inline; filename="[^"/\\]+\.png"/);
    expect(Buffer.compare(got.body as Buffer, PNG_1X1)).toBe(0);

    expect((await t.anonymous().get(att.url)).status).toBe(401);
    expect((await viewer.get('/api/attachments/99999')).status).toBe(404);
    expect((await trainer.get(`/api/annotations/${note.id}`)).body.attachments).toHaveLength(1);
  });

  it('a JPEG is accepted by its content whatever its name', async () => {
    const note = (await createNote({ position: [0, 0, 0], title: 'JPEG' })).body;
    const up = await trainer
      .post(`/api/annotations/${note.id}/attachments`)
      .attach('file', JPEG_START, 'photo.bin');
    expect(up.status).toBe(201);
    expect(up.body.attachment).toMatchObject({ mimeType: 'image/jpeg', fileName: 'photo.jpg' });
  });

  it('a text file named .png is refused (415) and nothing is stored', async () => {
    const note = (await createNote({ position: [0, 0, 0], title: 'Fake' })).body;
    const before = fs.existsSync(path.join(t.dir, 'uploads'))
      ? fs.readdirSync(path.join(t.dir, 'uploads')).length
      : 0;
    const res = await trainer
      .post(`/api/annotations/${note.id}/attachments`)
      .attach('file', Buffer.from('<svg onload="alert(1)"></svg>'), {
        filename: 'x.png',
        contentType: 'image/png',
      });
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('UNSUPPORTED_MEDIA_TYPE');
    const after = fs.existsSync(path.join(t.dir, 'uploads'))
      ? fs.readdirSync(path.join(t.dir, 'uploads')).length
      : 0;
    expect(after).toBe(before);
    expect((await trainer.get(`/api/annotations/${note.id}`)).body.attachments).toEqual([]);
  });

  it('over the size cap: 413', async () => {
    const note = (await createNote({ position: [0, 0, 0], title: 'Huge' })).body;
    const big = Buffer.concat([PNG_1X1, Buffer.alloc(ATTACHMENT_MAX_BYTES)]);
    const res = await trainer.post(`/api/annotations/${note.id}/attachments`).attach('file', big, 'big.png');
    expect(res.status).toBe(413);
    expect((await trainer.get(`/api/annotations/${note.id}`)).body.attachments).toEqual([]);
  });
});
