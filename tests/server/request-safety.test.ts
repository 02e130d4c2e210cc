import fs from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '@shared/errors';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation, postStationDocument } from '../setup/stations';
import { makeTestApp, type TestApp } from '../setup/test-app';

/**
 * Holes a hostile test of the running server found, one test each: the answer is a clear 4xx in the
 * error shape, never a 500, and what a person may do is what the rules say.
 */

const ORIGIN = 'http://tetherwise.test';
const PASSWORD = 'tetherwise-demo';

let t: TestApp;
let stationId: number;
let stationVersion: number;

const errorCode = (body: unknown) => ErrorBodySchema.parse(body).error.code;

beforeAll(async () => {
  let station;
  ({ t, station } = await makeAppWithStation(undefined, { publicOrigin: ORIGIN }));
  ({ id: stationId, version: stationVersion } = station);
});
afterAll(() => t.close());

function planBody(title: string) {
  return {
    title,
    stationId,
    date: '2031-05-02',
    crew: { EV1: { name: 'Ana Vidal' }, EV2: { name: 'Bo Lindgren' } },
    tasks: [{ title: 'Inspect the pump site', worksite: K.worksite, crew: 'EV1', durationSeconds: 600 }],
  };
}

describe('segments are bounded', () => {
  it('a segment over 1,000 m on a side is refused, at import and by an edit', async () => {
    const engineer = await t.agent('engineer');
    const huge = buildStationDocument({
      segments: [{ key: 'VAST', kind: 'platform', center: [0, 0, -3000], size: [4000, 4000, 3] }],
    });
    const imported = await postStationDocument(engineer, huge);
    expect(imported.status).toBe(400);
    expect(imported.body.error.details).toContainEqual({
      path: 'segments[0].size[0]',
      message: 'size must be at most 1000 m on a side',
    });
    const edited = await engineer
      .patch(`/api/stations/${stationId}/segments/${K.segment}`)
      .send({ version: stationVersion, segment: { size: [10, 4000, 3] } });
    expect(edited.status).toBe(400);
    expect(errorCode(edited.body)).toBe('VALIDATION_FAILED');
  });
});

describe('plan CSV export', () => {
  it('formula injection does not survive a line break in a cell', async () => {
    const planner = await t.agent('planner');
    const title = '=HYPERLINK("http://evil.example/x","Open")\nthen the pump';
    const plan = await planner.post('/api/plans').send({
      ...planBody('Formula plan'),
      tasks: [{ ...planBody('x').tasks[0], title }],
    });
    expect(plan.status, JSON.stringify(plan.body)).toBe(201);
    const csv = await planner.get(`/api/plans/${plan.body.id}/export.csv`).buffer(true);
    expect(csv.status).toBe(200);
    const rows = Papa.parse<string[]>(csv.text.trim(), { skipEmptyLines: true }).data;
    const cells = rows.flat();
    expect(cells).toContain(`'${title}`);
    // no cell a spreadsheet would evaluate: none starts with = + - @ or a tab or line break
    for (const cell of cells) expect(cell, JSON.stringify(cell)).not.toMatch(/^[=+\-@\t\r\n]/);
  });
});

describe('four-eyes review', () => {
  it('nobody who changed the submitted plan approves it: planner B edits A’s plan, submits it and cannot approve it', async () => {
    const a = await t.agent('planner');
    const b = await t.agent('planner2');
    const created = await a.post('/api/plans').send(planBody('Four eyes'));
    expect(created.status).toBe(201);
    const id = created.body.id;
    const edited = await b.patch(`/api/plans/${id}`).send({
      version: created.body.version,
      tasks: [{ ...planBody('x').tasks[0], durationSeconds: 1200 }],
    });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);
    expect(edited.body.editors.map((e: { name: string }) => e.name).sort()).toEqual([
      'Priya Lindqvist',
      'Tomas Reyes',
    ]);
    const submitted = await b.post(`/api/plans/${id}/submit`).send({ version: edited.body.version });
    expect(submitted.status).toBe(200);
    const approve = (agent: typeof a, version: number) =>
      agent.post(`/api/plans/${id}/approve`).send({ version });
    const byB = await approve(b, submitted.body.version);
    expect(byB.status).toBe(403);
    expect(byB.body.error.message).toMatch(/changed this plan/);
    expect((await approve(a, submitted.body.version)).status).toBe(403);

    // someone who changed nothing approves; once approved and reopened, B's old edit was reviewed
    const admin = await t.agent('admin');
    const approved = await approve(admin, submitted.body.version);
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(approved.body.editors).toEqual([]);
    const reopened = await admin
      .post(`/api/plans/${id}/return`)
      .send({ version: approved.body.version, comment: 'one more look' });
    const resubmitted = await a.post(`/api/plans/${id}/submit`).send({ version: reopened.body.version });
    expect((await approve(b, resubmitted.body.version)).status).toBe(200);
  });
});

describe('static files and multipart bodies', () => {
  it('a missing static file is a 404 in the error shape, not a 500', async () => {
    const clientDir = path.join(t.dir, 'client');
    fs.mkdirSync(path.join(clientDir, 'assets'), { recursive: true });
    fs.writeFileSync(path.join(clientDir, 'index.html'), '<!doctype html><title>Tetherwise</title>');
    fs.writeFileSync(path.join(clientDir, 'assets', 'app.js'), 'console.log(1);');
    const withClient = await makeTestApp({ clientDir });
    try {
      const agent = withClient.anonymous();
      expect((await agent.get('/assets/app.js')).status).toBe(200);
      const missing = await agent.get('/assets/nonexistent.js');
      expect(missing.status).toBe(404);
      expect(errorCode(missing.body)).toBe('NOT_FOUND');
      // the other refusals of the static files are 4xx in the shape too: a path out of the folder,
      // a range past the end
      const outside = await agent.get('/assets/%2e%2e/index.html');
      expect(outside.status).toBe(403);
      expect(errorCode(outside.body)).toBe('FORBIDDEN');
      const range = await agent.get('/assets/app.js').set('Range', 'bytes=5000-6000');
      expect(range.status).toBe(400);
      expect(errorCode(range.body)).toBe('VALIDATION_FAILED');
      expect((await agent.get('/plans/7')).status).toBe(200);
    } finally {
      await withClient.close();
    }
  });

  it('a malformed multipart body is a 400, not a 500: no boundary, cut off, a broken part header', async () => {
    const engineer = await t.agent('engineer');
    const boundary = 'XyZ';
    const cutOff = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="s.json"\r\n\r\n{"format":`;
    const brokenHeader = `--${boundary}\r\nContent-Disposition form-data\r\n\r\nx\r\n--${boundary}--\r\n`;
    const cases: [string, string][] = [
      ['multipart/form-data', 'anything'],
      [`multipart/form-data; boundary=${boundary}`, cutOff],
      [`multipart/form-data; boundary=${boundary}`, brokenHeader],
    ];
    for (const [type, body] of cases) {
      for (const url of ['/api/stations/import', `/api/stations/${stationId}/import-csv`]) {
        const res = await engineer.post(url).set('Content-Type', type).send(body);
        expect(res.status, `${url} ${type} ${JSON.stringify(res.body)}`).toBe(400);
        expect(errorCode(res.body)).toBe('VALIDATION_FAILED');
      }
    }
    const note = await (
      await t.agent('trainer')
    )
      .post(`/api/stations/${stationId}/annotations`)
      .send({ position: [0, 0, 0], title: 'multipart' });
    const image = await (
      await t.agent('trainer')
    )
      .post(`/api/annotations/${note.body.id}/attachments`)
      .set('Content-Type', `multipart/form-data; boundary=${boundary}`)
      .send(cutOff);
    expect(image.status).toBe(400);
  });
});

describe('cross-site requests', () => {
  it('CSRF: a state-changing request from another origin is refused with 403, whatever SameSite lets through', async () => {
    const engineer = await t.agent('engineer');
    // a page on another port of the same host is same-site: the cookie would go with it
    const sameSite = await postStationDocument(engineer)
      .set('Origin', 'http://tetherwise.test:8080')
      .set('Sec-Fetch-Site', 'same-site');
    expect(sameSite.status).toBe(403);
    expect(errorCode(sameSite.body)).toBe('FORBIDDEN');
    expect(sameSite.body.error.message).toMatch(/another site/);

    const viewer = request.agent(t.app);
    await viewer.post('/api/auth/sign-in').send({ email: 'viewer@example.org', password: PASSWORD });
    const signOut = await viewer
      .post('/api/auth/sign-out')
      .set('Origin', 'https://evil.example')
      .set('Content-Type', 'text/plain')
      .send('x');
    expect(signOut.status).toBe(403);
    expect((await viewer.get('/api/auth/me')).status).toBe(200);
    // a browser that sends only Sec-Fetch-Site, from elsewhere
    expect((await viewer.post('/api/auth/sign-out').set('Sec-Fetch-Site', 'cross-site')).status).toBe(403);

    // our own pages: the browser says same-origin, or the Origin is PUBLIC_ORIGIN
    const own = await postStationDocument(engineer).set('Origin', ORIGIN);
    expect(own.status).toBe(201);
    const sameOrigin = await postStationDocument(engineer)
      .set('Origin', 'http://127.0.0.1:3000')
      .set('Sec-Fetch-Site', 'same-origin');
    expect(sameOrigin.status).toBe(201);
    // reading is never refused; and a client that is no browser sends neither header
    expect((await viewer.get('/api/stations').set('Origin', 'https://evil.example')).status).toBe(200);
    expect((await viewer.post('/api/auth/sign-out')).status).toBe(204);
  });
});

describe('sign-in lockout', () => {
  it('failures count per address and e-mail, and per e-mail: one guessed account locks neither the team nor the address', async () => {
    const limited = await makeTestApp({
      signInAttempts: 3,
      signInAccountAttempts: 5,
      trustProxy: 'loopback',
    });
    try {
      const signIn = (email: string, password: string, from: string) =>
        limited.anonymous().post('/api/auth/sign-in').set('X-Forwarded-For', from).send({ email, password });
      const statuses = async (email: string, from: string, n: number) => {
        const out: number[] = [];
        for (let i = 0; i < n; i++) out.push((await signIn(email, 'wrong', from)).status);
        return out;
      };
      expect(await statuses('viewer@example.org', '10.0.0.1', 4)).toEqual([401, 401, 401, 429]);
      // the same address, another person: not locked (one office behind one address)
      expect((await signIn('planner@example.org', PASSWORD, '10.0.0.1')).status).toBe(200);
      expect((await signIn('Planner@Example.org', 'wrong', '10.0.0.1')).status).toBe(401);
      // the guessed account from another address: two more failures reach its own limit
      expect(await statuses('viewer@example.org', '10.0.0.2', 3)).toEqual([401, 401, 429]);
      expect((await signIn('viewer@example.org', PASSWORD, '10.0.0.3')).status).toBe(429);
      const locked = await signIn('viewer@example.org', PASSWORD, '10.0.0.3');
      expect(errorCode(locked.body)).toBe('RATE_LIMITED');
    } finally {
      await limited.close();
    }
  });

  it('without TRUST_PROXY a client cannot choose its address with X-Forwarded-For', async () => {
    const limited = await makeTestApp({ signInAttempts: 2, signInAccountAttempts: 100 });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++)
        statuses.push(
          (
            await limited
              .anonymous()
              .post('/api/auth/sign-in')
              .set('X-Forwarded-For', `10.0.1.${i}`)
              .send({ email: 'viewer@example.org', password: 'wrong' })
          ).status,
        );
      expect(statuses).toEqual([401, 401, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('sessions', () => {
  it('sign-out revokes the token: a kept copy of the cookie no longer signs anyone in', async () => {
    const agent = request.agent(t.app);
    const signIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: 'trainer@example.org', password: PASSWORD });
    const cookie = signIn.headers['set-cookie'][0].split(';')[0];
    const other = request.agent(t.app);
    await other.post('/api/auth/sign-in').send({ email: 'trainer@example.org', password: PASSWORD });
    expect((await t.anonymous().get('/api/auth/me').set('Cookie', cookie)).status).toBe(200);
    expect((await agent.post('/api/auth/sign-out')).status).toBe(204);
    const replayed = await t.anonymous().get('/api/auth/me').set('Cookie', cookie);
    expect(replayed.status).toBe(401);
    // only that session ended
    expect((await other.get('/api/auth/me')).status).toBe(200);
  });
});

describe('image attachments', () => {
  it('an image declaring 100,000 × 100,000 px is refused (413), and nothing is stored', async () => {
    const trainer = await t.agent('trainer');
    const note = await trainer
      .post(`/api/stations/${stationId}/annotations`)
      .send({ position: [0, 0, 0], title: 'huge' });
    const png = Buffer.from(
      'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
      'base64',
    );
    png.writeUInt32BE(100_000, 16);
    png.writeUInt32BE(100_000, 20);
    const res = await trainer
      .post(`/api/annotations/${note.body.id}/attachments`)
      .attach('file', png, 'bomb.png');
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/100000 × 100000 px/);
    const uploads = path.join(t.dir, 'uploads');
    expect(fs.existsSync(uploads) ? fs.readdirSync(uploads) : []).toEqual([]);
  });
});
