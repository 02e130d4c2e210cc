import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '@shared/errors';
import { makeTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(() => t.close());

const expectErrorShape = (body: unknown, code: string) => {
  const parsed = ErrorBodySchema.parse(body);
  expect(parsed.error.code).toBe(code);
  expect(JSON.stringify(body)).not.toMatch(/at .*\.ts:\d+/);
};

describe('health and the fixed auth interface', () => {
  it('GET /api/health → 200 {ok:true}', async () => {
    const res = await t.anonymous().get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true });
  });

  it('sign-in returns {user:{id,email,name,role}} and an httpOnly SameSite=Lax cookie with an expiry', async () => {
    const res = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'planner@example.org', password: 'tetherwise-demo' });
    expect(res.status).toBe(200);
    expect(Object.keys(res.body.user).sort()).toEqual(['email', 'id', 'name', 'role']);
    expect(res.body.user).toMatchObject({ email: 'planner@example.org', role: 'planner' });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/tw_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).toMatch(/Expires=|Max-Age=/i);
  });

  it('e-mail is matched case-insensitively', async () => {
    const res = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: ' Planner@Example.ORG ', password: 'tetherwise-demo' });
    expect(res.status).toBe(200);
  });

  it('wrong password and unknown e-mail → 401 in the error shape, same message', async () => {
    const a = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'planner@example.org', password: 'nope' });
    const b = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'nobody@example.org', password: 'nope' });
    expect(a.status).toBe(401);
    expect(b.status).toBe(401);
    expectErrorShape(a.body, 'UNAUTHENTICATED');
    expect(a.body.error.message).toBe(b.body.error.message);
  });

  it('GET /api/auth/me with and without a session', async () => {
    const agent = await t.agent('engineer');
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.role).toBe('engineer');
    const anon = await t.anonymous().get('/api/auth/me');
    expect(anon.status).toBe(401);
    expectErrorShape(anon.body, 'UNAUTHENTICATED');
  });

  it('sign-out clears the cookie', async () => {
    const agent = request.agent(t.app);
    await agent.post('/api/auth/sign-in').send({ email: 'viewer@example.org', password: 'tetherwise-demo' });
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    const out = await agent.post('/api/auth/sign-out');
    expect(out.status).toBe(204);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });

  it('a session just used (and so held for a few seconds) is refused at once after sign-out, copies of its cookie too', async () => {
    const agent = request.agent(t.app);
    const signedIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: 'viewer@example.org', password: 'tetherwise-demo' });
    const cookie = signedIn.headers['set-cookie'][0].split(';')[0];
    for (let i = 0; i < 3; i++)
      expect((await t.anonymous().get('/api/auth/me').set('Cookie', cookie)).status).toBe(200);
    expect((await agent.post('/api/auth/sign-out')).status).toBe(204);
    expect((await t.anonymous().get('/api/auth/me').set('Cookie', cookie)).status).toBe(401);
  });

  it('a held session sees its person as they are now: a new name shows on the next request', async () => {
    const admin = await t.agent('admin');
    const engineer = await t.agent('engineer');
    const me = (await engineer.get('/api/auth/me')).body.user as { id: number; name: string };
    const renamed = await admin.patch(`/api/users/${me.id}`).send({ name: 'Renamed Engineer' });
    expect(renamed.status).toBe(200);
    expect((await engineer.get('/api/auth/me')).body.user.name).toBe('Renamed Engineer');
    await admin.patch(`/api/users/${me.id}`).send({ name: me.name });
  });

  it('a forged token, an unsigned token and an expired token → 401', async () => {
    const forged = jwt.sign({ tv: 0 }, 'some-other-secret', { subject: '1', expiresIn: '1h' });
    const unsigned = jwt.sign({ tv: 0 }, '', { subject: '1', algorithm: 'none' as never });
    const expired = jwt.sign({ tv: 0 }, 'test-secret-not-for-production', { subject: '1', expiresIn: -10 });
    for (const token of [forged, unsigned, expired, 'garbage']) {
      const res = await t.anonymous().get('/api/auth/me').set('Cookie', `tw_session=${token}`);
      expect(res.status).toBe(401);
    }
  });

  it('bad bodies → 400 with details, never 500', async () => {
    const cases: [string, string][] = [
      ['{bad json', 'application/json'],
      ['{"email":5,"password":[]}', 'application/json'],
      ['{"email":"not-an-email","password":"x"}', 'application/json'],
      ['{"email":"a@b.co","password":"x","extra":1}', 'application/json'],
      ['email=a', 'application/x-www-form-urlencoded'],
      ['[]', 'application/json'],
      ['null', 'application/json'],
    ];
    for (const [body, type] of cases) {
      const res = await t.anonymous().post('/api/auth/sign-in').set('Content-Type', type).send(body);
      expect(res.status, body).toBe(400);
      expectErrorShape(res.body, 'VALIDATION_FAILED');
    }
  });

  it('unknown API routes → 404 in the error shape', async () => {
    const res = await t.anonymous().get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expectErrorShape(res.body, 'NOT_FOUND');
  });

  it('security headers: helmet CSP of our own, nosniff, no X-Powered-By', async () => {
    const res = await t.anonymous().get('/api/health');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/);
    expect(res.headers['content-security-policy']).toMatch(/frame-ancestors 'none'/);
  });
});

describe('sign-in rate limit', () => {
  it('repeated failures → 429 in the error shape; the right password does not count', async () => {
    const limited = await makeTestApp({ signInAttempts: 3 });
    try {
      const good = await limited
        .anonymous()
        .post('/api/auth/sign-in')
        .send({ email: 'admin@example.org', password: 'tetherwise-demo' });
      expect(good.status).toBe(200);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const r = await limited
          .anonymous()
          .post('/api/auth/sign-in')
          .send({ email: 'admin@example.org', password: 'wrong' });
        statuses.push(r.status);
        if (r.status === 429) expectErrorShape(r.body, 'RATE_LIMITED');
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('sign out everywhere', () => {
  it('ends every session of the user, not just this one', async () => {
    const a = request.agent(t.app);
    const b = request.agent(t.app);
    for (const agent of [a, b])
      await agent
        .post('/api/auth/sign-in')
        .send({ email: 'trainer@example.org', password: 'tetherwise-demo' });
    expect((await b.get('/api/auth/me')).status).toBe(200);
    expect((await a.post('/api/auth/sign-out-everywhere')).status).toBe(204);
    expect((await a.get('/api/auth/me')).status).toBe(401);
    expect((await b.get('/api/auth/me')).status).toBe(401);
    const again = request.agent(t.app);
    await again.post('/api/auth/sign-in').send({ email: 'trainer@example.org', password: 'tetherwise-demo' });
    expect((await again.get('/api/auth/me')).status).toBe(200);
  });
});

describe('general API rate limit', () => {
  it('past the per-minute allowance every API call gets 429 in the error shape', async () => {
    const limited = await makeTestApp({ apiRequestsPerMinute: 5 });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 7; i++) statuses.push((await limited.anonymous().get('/api/health')).status);
      expect(statuses).toEqual([200, 200, 200, 200, 200, 429, 429]);
      const res = await limited.anonymous().get('/api/stations');
      expect(res.status).toBe(429);
      expectErrorShape(res.body, 'RATE_LIMITED');
    } finally {
      await limited.close();
    }
  });
});
