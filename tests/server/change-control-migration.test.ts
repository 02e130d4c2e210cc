import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { afterAll, describe, expect, it } from 'vitest';
import { MIGRATIONS_FOLDER } from '../../server/db/client';
import { createApp } from '../../server/app';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-users';
import request from 'supertest';
import bcrypt from 'bcryptjs';

const dirs: string[] = [];
const tmp = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-migrate-'));
  dirs.push(d);
  return d;
};
afterAll(() => dirs.forEach((d) => fs.rmSync(d, { recursive: true, force: true })));

/** A copy of the migrations folder holding only the migrations before `tag`. */
function migrationsBefore(tag: string): string {
  const dir = tmp();
  fs.mkdirSync(path.join(dir, 'meta'));
  const journal = JSON.parse(fs.readFileSync(path.join(MIGRATIONS_FOLDER, 'meta', '_journal.json'), 'utf8'));
  const idx = journal.entries.findIndex((e: { tag: string }) => e.tag === tag);
  expect(idx).toBeGreaterThan(0);
  journal.entries = journal.entries.slice(0, idx);
  fs.writeFileSync(path.join(dir, 'meta', '_journal.json'), JSON.stringify(journal));
  for (const e of journal.entries) {
    fs.copyFileSync(path.join(MIGRATIONS_FOLDER, `${e.tag}.sql`), path.join(dir, `${e.tag}.sql`));
  }
  return dir;
}

const OLD_TABLES = ['users', 'stations', 'nodes', 'edges', 'plans', 'tasks', 'manifest_items', 'plan_audit'];

function dump(file: string) {
  const db = new Database(file, { readonly: true });
  try {
    return Object.fromEntries(
      OLD_TABLES.map((t) => [
        t,
        db.prepare(`select * from "${t}" order by rowid`).all() as Record<string, unknown>[],
      ]),
    );
  } finally {
    db.close();
  }
}

describe('the change-control migration keeps all existing data', () => {
  it('an old database keeps every row, its reviewed plans pin the station as it is, and the station history starts there', async () => {
    const dir = tmp();
    const file = path.join(dir, 'old.db');
    const sqlite = new Database(file);
    sqlite.pragma('foreign_keys = ON');
    migrate(drizzle(sqlite), { migrationsFolder: migrationsBefore('0004_change_control') });
    const run = (sql: string) => sqlite.prepare(sql).run();
    sqlite
      .prepare(
        "insert into users (email, name, role, password_hash) values ('old@example.org', 'Old Planner', 'planner', ?)",
      )
      .run(bcrypt.hashSync(DEMO_PASSWORD, 4));
    run(
      `insert into stations (name, version, altitude_km, beta_deg, settings_json) values ('Old Station', 7, 410, 20, '{}')`,
    );
    run("insert into nodes (station_id, key, kind, x, y, z, ord) values (1, 'AL', 'airlock', 0, 0, 0, 0)");
    run("insert into nodes (station_id, key, kind, x, y, z, ord) values (1, 'A1', 'anchor', 3, 0, 0, 1)");
    run("insert into nodes (station_id, key, kind, x, y, z, ord) values (1, 'W1', 'worksite', 6, 0, 0, 2)");
    run("insert into edges (station_id, from_key, to_key, kind, ord) values (1, 'AL', 'A1', 'handrail', 0)");
    run("insert into edges (station_id, from_key, to_key, kind, ord) values (1, 'A1', 'W1', 'handrail', 1)");
    for (const [title, status] of [
      ['Old draft', 'draft'],
      ['Old review', 'in-review'],
      ['Old approved', 'approved'],
    ]) {
      run(
        `insert into plans (station_id, title, date, status, version, author_id, settings_json) values (1, '${title}', '2030-01-01', '${status}', 3, 1, '{"routeMode":"balanced","allowRide":false,"orbitPhaseAtStartDeg":0,"betaDegOverride":null,"timeLimitSeconds":23400,"egressSeconds":600,"ingressSeconds":600}')`,
      );
    }
    run(
      "insert into tasks (plan_id, ord, title, worksite_key, crew, duration_seconds) values (3, 0, 'Old task', 'W1', 'EV1', 600)",
    );
    run("insert into crew_slots (plan_id, slot, name, tether_length_m) values (3, 'EV1', 'A', 25.9)");
    run("insert into crew_slots (plan_id, slot, name, tether_length_m) values (3, 'EV2', 'B', 25.9)");
    run(
      "insert into manifest_items (plan_id, ord, key, name, kind, starts_at) values (3, 0, 'bag', 'Old bag', 'bag', 'airlock')",
    );
    run("insert into plan_audit (plan_id, user_id, action, version_after) values (3, 1, 'create', 1)");
    sqlite.close();
    const before = dump(file);

    const app = await createApp({
      config: {
        databaseUrl: file,
        dataDir: dir,
        clientDir: null,
        logLevel: 'silent',
        seedDemo: false,
        jwtSecret: 'test-secret',
        routeWorkers: 0,
      },
      seed: true,
    });
    try {
      const after = dump(file);
      for (const table of OLD_TABLES) {
        // every column the old row had keeps its value; columns this and later migrations add (with
        // their defaults) are not part of the old data
        const kept = (rows: Record<string, unknown>[]) =>
          rows.map((row, i) =>
            Object.fromEntries(
              Object.keys(before[table][i] ?? row)
                .filter((k) => k !== 'submitted_station_version' && k !== 'approved_station_version')
                .map((k) => [k, row[k]]),
            ),
          );
        expect(after[table].length, table).toBe(before[table].length);
        expect(kept(after[table]), table).toEqual(kept(before[table]));
      }
      const pins = Object.fromEntries(
        after.plans.map((p) => [p.title, [p.submitted_station_version, p.approved_station_version]]),
      );
      expect(pins).toEqual({ 'Old draft': [null, null], 'Old review': [7, null], 'Old approved': [7, 7] });

      const agent = request.agent(app.app);
      await agent.post('/api/auth/sign-in').send({ email: 'old@example.org', password: DEMO_PASSWORD });
      const versions = (await agent.get('/api/stations/1/versions')).body;
      expect(versions).toMatchObject({ currentVersion: 7, firstKeptVersion: 7, total: 1 });
      expect(versions.items[0]).toMatchObject({ version: 7, action: 'station.baseline' });
      const graph = (await agent.get('/api/stations/1/graph?version=7')).body;
      expect(graph.nodes.map((n: { key: string }) => n.key)).toEqual(['AL', 'A1', 'W1']);
      const older = await agent.get('/api/stations/1/graph?version=6');
      expect(older.status).toBe(404);
      expect(older.body.error.message).toContain('kept from version 7');
    } finally {
      await app.close();
    }
  });
});
