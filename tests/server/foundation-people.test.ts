import request from 'supertest';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passwordTokens } from '../../server/db/schema';
import { makeTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp({ publicOrigin: 'http://tetherwise.test' });
});
afterAll(() => t.close());

async function inviteAndGetToken(email: string, role = 'trainer') {
  const admin = await t.agent('admin');
  const res = await admin.post('/api/users/invite').send({ email, name: 'Rin Test', role });
  expect(res.status).toBe(201);
  const mail = (await admin.get('/api/mailbox')).body.find((m: { to: string }) => m.to === email);
  expect(mail).toBeTruthy();
  const match = /http:\/\/tetherwise\.test\/set-password\?token=([A-Za-z0-9_%-]+)/.exec(mail.text);
  expect(match).toBeTruthy();
  return { user: res.body.user, token: decodeURIComponent(match![1]) };
}

describe('people and invitations (admin)', () => {
  it('GET /api/users lists the demo team for an admin; 403 for other roles; 401 signed out', async () => {
    const admin = await t.agent('admin');
    const res = await admin.get('/api/users');
    expect(res.status).toBe(200);
    expect(res.body.map((u: { email: string }) => u.email).sort()).toEqual(
      ['admin', 'engineer', 'planner', 'planner2', 'trainer', 'viewer'].map((r) => `${r}@example.org`).sort(),
    );
    for (const u of res.body) expect(u).not.toHaveProperty('passwordHash');
    for (const role of ['planner', 'engineer', 'trainer', 'viewer'] as const) {
      expect((await (await t.agent(role)).get('/api/users')).status).toBe(403);
    }
    expect((await t.anonymous().get('/api/users')).status).toBe(401);
  });

  it('invite → the mail arrives through the local SMTP service → the link sets a password → sign in', async () => {
    const { user, token } = await inviteAndGetToken('new.person@example.org');
    expect(user).toMatchObject({ email: 'new.person@example.org', role: 'trainer', invitePending: true });
    // cannot sign in before setting a password
    expect(
      (await t.anonymous().post('/api/auth/sign-in').send({ email: 'new.person@example.org', password: 'x' }))
        .status,
    ).toBe(401);

    const inv = await t.anonymous().get(`/api/auth/invitations/${token}`);
    expect(inv.status).toBe(200);
    expect(inv.body).toEqual({ email: 'new.person@example.org', name: 'Rin Test' });

    const agent = request.agent(t.app);
    const set = await agent
      .post('/api/auth/set-password')
      .send({ token, password: 'a long enough passphrase' });
    expect(set.status).toBe(200);
    expect(set.body.user.email).toBe('new.person@example.org');
    expect((await agent.get('/api/auth/me')).body.user.role).toBe('trainer');

    // single use
    const again = await t
      .anonymous()
      .post('/api/auth/set-password')
      .send({ token, password: 'another passphrase!' });
    expect(again.status).toBe(404);
    expect((await t.anonymous().get(`/api/auth/invitations/${token}`)).status).toBe(404);

    const signIn = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'new.person@example.org', password: 'a long enough passphrase' });
    expect(signIn.status).toBe(200);
  });

  it('an expired link is refused', async () => {
    const { token, user } = await inviteAndGetToken('late.person@example.org');
    t.ctx.db
      .update(passwordTokens)
      .set({ expiresAt: new Date(Date.now() - 1000).toISOString() })
      .where(eq(passwordTokens.userId, user.id))
      .run();
    const res = await t
      .anonymous()
      .post('/api/auth/set-password')
      .send({ token, password: 'a long enough passphrase' });
    expect(res.status).toBe(404);
    expect(res.body.error.message).toMatch(/expired|used/);
  });

  it('a short password is refused with a clear message', async () => {
    const { token } = await inviteAndGetToken('short.pw@example.org');
    const res = await t.anonymous().post('/api/auth/set-password').send({ token, password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ path: 'body.password' });
  });

  it('inviting an existing e-mail → 409; bad invite bodies → 400', async () => {
    const admin = await t.agent('admin');
    expect(
      (
        await admin
          .post('/api/users/invite')
          .send({ email: 'PLANNER@example.org', name: 'X', role: 'viewer' })
      ).status,
    ).toBe(409);
    for (const body of [
      {},
      { email: 'x', name: 'X', role: 'viewer' },
      { email: 'a@b.co', name: '', role: 'viewer' },
      { email: 'a@b.co', name: 'A', role: 'pilot' },
    ]) {
      const res = await admin.post('/api/users/invite').send(body);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('VALIDATION_FAILED');
    }
  });

  it('changing a role or disabling ends the person’s sessions; enabling lets them sign in again', async () => {
    const admin = await t.agent('admin');
    const users = (await admin.get('/api/users')).body as { id: number; email: string }[];
    const viewer = users.find((u) => u.email === 'viewer@example.org')!;
    const session = request.agent(t.app);
    await session
      .post('/api/auth/sign-in')
      .send({ email: 'viewer@example.org', password: 'tetherwise-demo' });
    expect((await session.get('/api/auth/me')).status).toBe(200);

    const promoted = await admin.patch(`/api/users/${viewer.id}`).send({ role: 'trainer' });
    expect(promoted.status).toBe(200);
    expect(promoted.body.user.role).toBe('trainer');
    expect((await session.get('/api/auth/me')).status).toBe(401);

    await session
      .post('/api/auth/sign-in')
      .send({ email: 'viewer@example.org', password: 'tetherwise-demo' });
    expect((await session.get('/api/auth/me')).body.user.role).toBe('trainer');
    expect((await admin.patch(`/api/users/${viewer.id}`).send({ disabled: true })).status).toBe(200);
    expect((await session.get('/api/auth/me')).status).toBe(401);
    const refused = await t
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'viewer@example.org', password: 'tetherwise-demo' });
    expect(refused.status).toBe(401);
    expect(refused.body.error.message).toMatch(/disabled/);

    expect(
      (await admin.patch(`/api/users/${viewer.id}`).send({ disabled: false, role: 'viewer' })).status,
    ).toBe(200);
    expect(
      (
        await t
          .anonymous()
          .post('/api/auth/sign-in')
          .send({ email: 'viewer@example.org', password: 'tetherwise-demo' })
      ).status,
    ).toBe(200);
  });

  it('an admin cannot disable or demote themselves; unknown ids 404; bad ids 400', async () => {
    const admin = await t.agent('admin');
    const me = (await admin.get('/api/auth/me')).body.user;
    expect((await admin.patch(`/api/users/${me.id}`).send({ disabled: true })).status).toBe(400);
    expect((await admin.patch(`/api/users/${me.id}`).send({ role: 'viewer' })).status).toBe(400);
    expect((await admin.patch('/api/users/99999').send({ role: 'viewer' })).status).toBe(404);
    expect((await admin.patch('/api/users/abc').send({ role: 'viewer' })).status).toBe(400);
    expect((await admin.patch(`/api/users/${me.id}`).send({})).status).toBe(400);
  });

  it('resend-invite sends a fresh link; not for someone who already has a password', async () => {
    const { user } = await inviteAndGetToken('resend.me@example.org');
    const admin = await t.agent('admin');
    const before = (await admin.get('/api/mailbox')).body.length;
    expect((await admin.post(`/api/users/${user.id}/resend-invite`)).status).toBe(204);
    expect((await admin.get('/api/mailbox')).body.length).toBe(before + 1);
    const planner = (await admin.get('/api/users')).body.find(
      (u: { email: string }) => u.email === 'planner@example.org',
    );
    expect((await admin.post(`/api/users/${planner.id}/resend-invite`)).status).toBe(400);
  });
});

describe('mailbox', () => {
  it('GET /api/mailbox → [{to,subject,text,receivedAt}] for admins only', async () => {
    const admin = await t.agent('admin');
    const res = await admin.get('/api/mailbox');
    expect(res.status).toBe(200);
    expect(res.body.length).toBeGreaterThan(0);
    for (const m of res.body) expect(Object.keys(m).sort()).toEqual(['receivedAt', 'subject', 'text', 'to']);
    expect((await (await t.agent('planner')).get('/api/mailbox')).status).toBe(403);
  });
});
