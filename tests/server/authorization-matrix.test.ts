import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '@shared/auth/permissions';
import { routeTable } from '../../server/lib/route';
import { makeTestApp, type TestApp } from '../setup/test-app';

/**
 * Every API route × every role, written out by hand from the roles table of the design (who may do
 * what), not derived from the code's permission table: the test fails if the two disagree, and it
 * fails when a route is added without a row here.
 */
type Who = 'public' | 'everyone' | readonly Role[];
const ADMIN: readonly Role[] = ['admin'];
const PLANNERS: readonly Role[] = ['admin', 'planner'];
const ENGINEERS: readonly Role[] = ['admin', 'engineer'];
const TRAINERS: readonly Role[] = ['admin', 'trainer'];
const WRITERS: readonly Role[] = ['admin', 'planner', 'engineer', 'trainer'];

const MATRIX: Record<string, Who> = {
  'GET /api/health': 'public',
  'POST /api/auth/sign-in': 'public',
  'POST /api/auth/sign-out': 'public',
  'POST /api/auth/sign-out-everywhere': 'everyone',
  'GET /api/auth/me': 'everyone',
  'GET /api/auth/invitations/:token': 'public',
  'POST /api/auth/set-password': 'public',
  'GET /api/users/': ADMIN,
  'POST /api/users/invite': ADMIN,
  'PATCH /api/users/:id': ADMIN,
  'POST /api/users/:id/resend-invite': ADMIN,
  'GET /api/mailbox/': ADMIN,
  'GET /api/compute/stats': ADMIN,
  'DELETE /api/mailbox/': ADMIN,
  'GET /api/activity/': 'everyone',
  'GET /api/stations/': 'everyone',
  'POST /api/stations/import': ENGINEERS,
  'GET /api/stations/:id': 'everyone',
  'PATCH /api/stations/:id': ENGINEERS,
  'PUT /api/stations/:id/import': ENGINEERS,
  'POST /api/stations/:id/import-csv': ENGINEERS,
  'GET /api/stations/:id/graph': 'everyone',
  'GET /api/stations/:id/graph/columns': 'everyone',
  'GET /api/stations/:id/export': 'everyone',
  'GET /api/stations/:id/audit': 'everyone',
  'GET /api/stations/:id/versions': 'everyone',
  'GET /api/stations/:id/versions/:version': 'everyone',
  'DELETE /api/stations/:id': ENGINEERS,
  'POST /api/stations/:id/nodes': ENGINEERS,
  'PATCH /api/stations/:id/nodes/:key': ENGINEERS,
  'DELETE /api/stations/:id/nodes/:key': ENGINEERS,
  'POST /api/stations/:id/edges': ENGINEERS,
  'PATCH /api/stations/:id/edges/:edgeId': ENGINEERS,
  'DELETE /api/stations/:id/edges/:edgeId': ENGINEERS,
  'POST /api/stations/:id/hazards': ENGINEERS,
  'PATCH /api/stations/:id/hazards/:key': ENGINEERS,
  'DELETE /api/stations/:id/hazards/:key': ENGINEERS,
  'POST /api/stations/:id/segments': ENGINEERS,
  'PATCH /api/stations/:id/segments/:key': ENGINEERS,
  'DELETE /api/stations/:id/segments/:key': ENGINEERS,
  'GET /api/stations/:id/annotations': 'everyone',
  'POST /api/stations/:id/annotations': WRITERS,
  'GET /api/annotations/:id': 'everyone',
  'PATCH /api/annotations/:id': WRITERS,
  'POST /api/annotations/:id/replies': WRITERS,
  'POST /api/annotations/:id/attachments': WRITERS,
  'GET /api/attachments/:id': 'everyone',
  'POST /api/stations/:id/routes': 'everyone',
  'POST /api/stations/:id/reach': 'everyone',
  'POST /api/stations/:id/socket-plan': 'everyone',
  'POST /api/stations/:id/route-matrix': 'everyone',
  'POST /api/stations/:id/socket-plan/accept': ENGINEERS,
  'GET /api/orbit': 'everyone',
  'GET /api/plans/': 'everyone',
  'POST /api/plans/': PLANNERS,
  'GET /api/plans/:id': 'everyone',
  'PATCH /api/plans/:id': PLANNERS,
  'DELETE /api/plans/:id': PLANNERS,
  'POST /api/plans/:id/submit': PLANNERS,
  'POST /api/plans/:id/approve': PLANNERS,
  'POST /api/plans/:id/return': PLANNERS,
  'GET /api/plans/:id/timeline': 'everyone',
  'POST /api/plans/:id/timeline-preview': 'everyone',
  'POST /api/plans/:id/sequence': 'everyone',
  'POST /api/plans/:id/duplicate': PLANNERS,
  'GET /api/plans/:id/revisions': 'everyone',
  'GET /api/plans/:id/compare': 'everyone',
  'GET /api/series/': 'everyone',
  'POST /api/series/': PLANNERS,
  'GET /api/series/:id': 'everyone',
  'PATCH /api/series/:id': PLANNERS,
  'DELETE /api/series/:id': PLANNERS,
  'GET /api/plans/:id/export.csv': 'everyone',
  'GET /api/plans/:id/export.pdf': 'everyone',
  'GET /api/walkthroughs/': 'everyone',
  'POST /api/walkthroughs/': TRAINERS,
  'GET /api/walkthroughs/:id': 'everyone',
  'PATCH /api/walkthroughs/:id': TRAINERS,
  'DELETE /api/walkthroughs/:id': TRAINERS,
  'POST /api/plans/:id/runs': PLANNERS,
  'GET /api/plans/:id/runs': 'everyone',
  'GET /api/runs/:id': 'everyone',
  'POST /api/runs/:id/events': PLANNERS,
  'GET /api/runs/:id/export.csv': 'everyone',
  'GET /api/runs/:id/export.pdf': 'everyone',
  'GET /api/stations/:id/flown-estimates': 'everyone',
  'GET /api/events/': 'everyone',
  'POST /api/events/presence': 'everyone',
};

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp({ seedDemo: true });
}, 120_000);
afterAll(() => t.close());

const ruleKey = (r: { method: string; path: string }) => `${r.method} ${r.path}`;

// Placeholder values: real ids of the demo content where one exists, so allowed roles get past
// routing; any 4xx other than 401/403 proves the access check let them through.
const fill = (path: string) =>
  path
    .replace(':token', 'x'.repeat(32))
    .replace(':key', 'NO-SUCH-KEY')
    .replace(':edgeId', '999999')
    .replace(/:id/g, '1');

async function call(role: Role | null, method: string, path: string) {
  const agent = role ? await t.agent(role) : t.anonymous();
  // the live stream stays open when it is let through: a too-long query makes it a 400 instead
  const url = path === '/api/events/' ? `${path}?lastEventId=${'x'.repeat(100)}` : fill(path);
  const m = method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  const req = agent[m](url);
  // a proposed order searches for its whole time budget: the least one is enough to pass the check
  const body = path === '/api/plans/:id/sequence' ? { budgetMs: 100 } : {};
  return method === 'GET' || method === 'DELETE' ? req : req.send(body);
}

describe('authorisation matrix', () => {
  it('every mounted route has a row, and every row a route (deny by default: no rule, no route)', () => {
    const mounted = routeTable.map(ruleKey).sort();
    expect(
      mounted.filter((k) => !(k in MATRIX)),
      'routes without a row in MATRIX',
    ).toEqual([]);
    expect(
      Object.keys(MATRIX).filter((k) => !mounted.includes(k)),
      'rows without a route',
    ).toEqual([]);
  });

  // sign-out-everywhere and the mailbox clear change state for later calls: run them last
  const order = (k: string) => (/sign-out|mailbox/.test(k) ? 1 : 0);
  const rows = Object.entries(MATRIX).sort((a, b) => order(a[0]) - order(b[0]));

  for (const [key, who] of rows) {
    const [method, path] = key.split(' ');
    it(`${key} → ${who === 'public' ? 'anyone' : who === 'everyone' ? 'every signed-in role' : who.join(', ')}`, async () => {
      const anon = await call(null, method, path);
      if (who === 'public') {
        expect(anon.status, `${key} is public`).not.toBe(403);
        expect(anon.status, `${key} is public`).toBeLessThan(500);
      } else {
        expect(anon.status, `${key} without a session`).toBe(401);
        expect(anon.body.error.code).toBe('UNAUTHENTICATED');
      }
      for (const role of ROLES) {
        if (who === 'public') continue;
        if (key === 'POST /api/auth/sign-out-everywhere') continue; // would end the shared sessions
        const res = await call(role, method, path);
        const allowed = who === 'everyone' || who.includes(role);
        if (allowed) {
          expect([401, 403], `${role} on ${key}: ${JSON.stringify(res.body)}`).not.toContain(res.status);
          expect(res.status, `${role} on ${key}`).toBeLessThan(500);
        } else {
          expect(res.status, `${role} on ${key}`).toBe(403);
          expect(res.body.error.code).toBe('FORBIDDEN');
        }
      }
    });
  }
});
