import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeAppWithStation } from '../setup/stations';
import { makeTestApp, type TestApp } from '../setup/test-app';
import { buildStationDocument, FIXTURE_KEYS } from '../factories/station-document';

let t: TestApp;
let stationId: number;
beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation());
});
afterAll(() => t.close());

const graphOf = async () => (await (await t.agent('viewer')).get(`/api/stations/${stationId}/graph`)).body;

describe('concurrent edits', () => {
  it('eight edits of one version at once: exactly one wins, seven get 409, nothing is overwritten', async () => {
    const before = await graphOf();
    const version = before.station.version;
    const engineer = await t.agent('engineer');
    const admin = await t.agent('admin');
    const results = await Promise.all(
      Array.from({ length: 8 }, (_, i) =>
        (i % 2 ? admin : engineer)
          .patch(`/api/stations/${stationId}/nodes/${FIXTURE_KEYS.anchorNear}`)
          .send({ version, node: { label: `edit ${i}` } }),
      ),
    );
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 409, 409, 409, 409, 409, 409, 409]);
    for (const r of results.filter((x) => x.status === 409)) expect(r.body.error.code).toBe('CONFLICT');
    const winner = results.findIndex((r) => r.status === 200);
    const after = await graphOf();
    expect(after.station.version).toBe(version + 1);
    expect(after.nodes.find((n: { key: string }) => n.key === FIXTURE_KEYS.anchorNear).label).toBe(
      `edit ${winner}`,
    );
  });

  it('eight concurrent plan edits of one version: one wins, seven 409', async () => {
    const planner = await t.agent('planner');
    const created = await planner.post('/api/plans').send({
      title: 'Concurrency check',
      stationId,
      date: '2027-03-01',
      crew: { EV1: { name: 'A. Crew', tetherLengthM: 25.9 }, EV2: { name: 'B. Crew', tetherLengthM: 25.9 } },
    });
    expect(created.status).toBe(201);
    const id = created.body.id ?? created.body.plan?.id;
    const version = created.body.version ?? created.body.plan?.version;
    const results = await Promise.all(
      Array.from({ length: 8 }, (_, i) =>
        planner.patch(`/api/plans/${id}`).send({ version, title: `Title ${i}` }),
      ),
    );
    expect(results.map((r) => r.status).sort()).toEqual([200, 409, 409, 409, 409, 409, 409, 409]);
  });
});

describe('a crash in the middle of an import', () => {
  it('leaves the old model whole (the process is killed after 20 new nodes were written)', async () => {
    const before = await graphOf();
    const child = spawnSync(
      process.execPath,
      [
        '--import',
        'tsx',
        path.join(__dirname, 'fixtures', 'crash-mid-import.ts'),
        t.ctx.config.databaseUrl,
        t.dir,
        String(stationId),
        String(before.station.version),
      ],
      { encoding: 'utf8', timeout: 60_000 },
    );
    expect(child.signal, child.stdout + child.stderr).toBe('SIGKILL');
    const after = await graphOf();
    expect(after).toEqual(before);
    expect(after.nodes).toHaveLength(buildStationDocument().nodes.length);
  });
});

describe('the JWT secret', () => {
  it('is generated into the data folder with owner-only permissions and reused', async () => {
    const fresh = await makeTestApp({ jwtSecret: undefined });
    try {
      // makeTestApp passes a fixed secret; this one resolves it from the data folder like production
      const { resolveJwtSecret } = await import('../../server/lib/env');
      const secret = resolveJwtSecret(fresh.dir, undefined);
      const file = path.join(fresh.dir, 'jwt-secret');
      expect(fs.statSync(file).mode & 0o777).toBe(0o600);
      expect(secret.length).toBeGreaterThanOrEqual(40);
      expect(resolveJwtSecret(fresh.dir, undefined)).toBe(secret);
      expect(resolveJwtSecret(fresh.dir, 'from-env')).toBe('from-env');
    } finally {
      await fresh.close();
    }
  });
});
