import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '@shared/errors';
import { routeTable } from '../../server/lib/route';
import { makeTestApp, type TestApp } from '../setup/test-app';

/**
 * Hostile input on every route that takes input: generated JSON bodies, query strings and path
 * parameters, sent as the admin (who passes every access check, so the input reaches the handlers).
 * Whatever arrives, the answer is never a 5xx, never a hang, and every error is in the one shape.
 */
// created before the tests are collected: the route table is filled as the app mounts its routers
const t: TestApp = await makeTestApp({ seedDemo: true });
afterAll(() => t.close());

const nastyShort = fc.oneof(
  fc.constantFrom(
    "' OR 1=1; --",
    '"; DROP TABLE users; --',
    '../../../../etc/passwd',
    '..%2f..%2f..%2fetc%2fpasswd',
    '%00',
    '\u0000',
    '<script>alert(1)</script>',
    '${7*7}',
    '__proto__',
    'constructor',
    'NaN',
    'Infinity',
    '-1',
    '1e309',
    '0x10',
    ' ',
    '',
  ),
  fc.string({ maxLength: 40 }),
  // long, but within what an HTTP request line carries (Node refuses longer URLs itself, before the app)
  fc.string({ minLength: 200, maxLength: 1500 }),
);

/** bodies may also carry very long strings */
const nasty = fc.oneof(nastyShort, fc.string({ minLength: 5000, maxLength: 20000 }));

const nastyNumber = fc.oneof(
  fc.constantFrom(1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, -0, 5e-324, 2 ** 31, -(2 ** 31) - 1),
  fc.double(),
  fc.integer(),
);

const jsonish = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: 'small' },
    nasty,
    nastyNumber,
    fc.boolean(),
    fc.constant(null),
    fc.array(tie('value'), { maxLength: 5 }),
    fc.dictionary(
      fc.oneof(
        nasty,
        fc.constantFrom('version', 'from', 'to', 'mode', 'email', 'targets', 'tasks', '__proto__'),
      ),
      tie('value'),
      { maxKeys: 5 },
    ),
  ),
})).value;

function deepNest(depth: number) {
  return '['.repeat(depth) + ']'.repeat(depth);
}

const inputRoutes = routeTable.filter(
  (r) => r.method !== 'GET' || /:\w+/.test(r.path) || r.path.includes('orbit'),
);

function expectSafe(status: number, body: unknown, what: string) {
  expect(status, what).toBeLessThan(500);
  if (status >= 400)
    expect(
      ErrorBodySchema.safeParse(body).success,
      `${what}: error shape ${JSON.stringify(body).slice(0, 200)}`,
    ).toBe(true);
}

describe('hostile input never breaks the server', () => {
  it('covers the routes that take input', () => expect(inputRoutes.length).toBeGreaterThan(30));
  for (const route of inputRoutes) {
    const key = `${route.method} ${route.path}`;
    if (/sign-out/.test(route.path)) continue; // would end the admin session the other checks use
    it(`${key}: generated bodies, params and queries → < 500, error shape`, async () => {
      const admin = await t.agent('admin');
      await fc.assert(
        fc.asyncProperty(jsonish, nastyShort, nastyShort, async (body, param, query) => {
          const url =
            route.path.replace(/:\w+/g, () => encodeURIComponent(param) || 'x') +
            `?version=${encodeURIComponent(query)}&altitudeKm=${encodeURIComponent(query)}&q=${encodeURIComponent(query)}`;
          const m = route.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
          const req = admin[m](url).timeout({ response: 10_000 });
          const res =
            route.method === 'GET'
              ? await req
              : await req.set('Content-Type', 'application/json').send(JSON.stringify(body));
          expectSafe(res.status, res.body, `${key} ${JSON.stringify(body).slice(0, 120)}`);
        }),
        { numRuns: 12, endOnFailure: true },
      );
    });
  }

  it('deeply nested JSON, a huge body, a wrong content type and a non-JSON body are 4xx', async () => {
    const admin = await t.agent('admin');
    const deep = await admin
      .post('/api/plans')
      .set('Content-Type', 'application/json')
      .send(deepNest(100_000));
    expectSafe(deep.status, deep.body, 'deep');
    expect(deep.status).toBeGreaterThanOrEqual(400);
    const huge = await admin
      .post('/api/plans')
      .set('Content-Type', 'application/json')
      .send(`{"title":"${'x'.repeat(3 * 1024 * 1024)}"}`);
    expect(huge.status).toBe(413);
    expect(huge.body.error.code).toBe('PAYLOAD_TOO_LARGE');
    const text = await admin
      .post('/api/stations/1/routes')
      .set('Content-Type', 'text/plain')
      .send('from=a&to=b');
    expect(text.status).toBe(400);
    const inf = await admin
      .post('/api/stations/1/routes')
      .set('Content-Type', 'application/json')
      .send('{"from":"a","to":"b","mode":"fastest","tetherLengthM":1e999}');
    expect(inf.status).toBe(400);
  });
});
