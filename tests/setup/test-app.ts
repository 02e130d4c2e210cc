import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { createApp, type AppInstance } from '../../server/app';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-users';
import type { AppConfig } from '../../server/lib/env';
import type { Role } from '@shared/auth/permissions';

export type TestAgent = ReturnType<typeof request.agent>;

export interface TestApp extends AppInstance {
  /** the temporary folder holding this app's database and uploads */
  dir: string;
  /** a supertest agent signed in as `<role>@example.org` (one per role, reused) */
  agent(role: Role | 'planner2'): Promise<TestAgent>;
  /** a supertest agent with no session */
  anonymous(): TestAgent;
}

/**
 * A fresh app on its own migrated SQLite file in a new temp folder, demo users seeded. The demo
 * station and plans are not seeded unless `{ seedDemo: true }` is passed.
 */
export async function makeTestApp(overrides: Partial<AppConfig> = {}): Promise<TestApp> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-test-'));
  const instance = await createApp({
    config: {
      databaseUrl: path.join(dir, 'test.db'),
      dataDir: dir,
      clientDir: null,
      logLevel: 'silent',
      seedDemo: false,
      jwtSecret: 'test-secret-not-for-production',
      // tests make many requests quickly; the limiter itself has its own tests
      apiRequestsPerMinute: 100_000,
      signInAttempts: 1000,
      signInAccountAttempts: 1000,
      ...overrides,
    },
    seed: true,
  });
  const agents = new Map<string, TestAgent>();

  return {
    ...instance,
    dir,
    async agent(role) {
      const cached = agents.get(role);
      if (cached) return cached;
      const agent = request.agent(instance.app);
      const res = await agent
        .post('/api/auth/sign-in')
        .send({ email: `${role}@example.org`, password: DEMO_PASSWORD });
      if (res.status !== 200)
        throw new Error(`sign-in as ${role} failed: ${res.status} ${JSON.stringify(res.body)}`);
      agents.set(role, agent);
      return agent;
    },
    anonymous: () => request(instance.app) as unknown as TestAgent,
    async close() {
      await instance.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A fresh test app (see `makeTestApp`) and the agent signed in on it as `role`. */
export async function makeTestAppAs(role: Role | 'planner2', overrides: Partial<AppConfig> = {}) {
  const t = await makeTestApp(overrides);
  return { t, agent: await t.agent(role) };
}
