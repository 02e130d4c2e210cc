import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string;
  }
}

const root = path.resolve(import.meta.dirname, '../..');
const HEALTH_TIMEOUT_MS = 90_000;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() =>
        address && typeof address === 'object' ? resolve(address.port) : reject(new Error('no port')),
      );
    });
  });
}

async function waitForHealth(url: string, server: ChildProcess, log: () => string) {
  const deadline = Date.now() + HEALTH_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`server exited with ${server.exitCode}:\n${log()}`);
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok && (await response.json()).ok === true) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`server did not answer /api/health within ${HEALTH_TIMEOUT_MS} ms:\n${log()}`);
}

export default async function setup(project: TestProject) {
  if (process.env.E2E_SKIP_BUILD !== '1') {
    // vitest sets NODE_ENV=test, which would make Vite bundle React's development build
    execFileSync('npx', ['vite', 'build', '--logLevel', 'warn'], {
      cwd: root,
      stdio: 'inherit',
      env: { ...process.env, NODE_ENV: 'production' },
    });
  }

  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-e2e-'));
  const port = await freePort();
  const baseURL = `http://localhost:${port}`;
  let output = '';
  const server = spawn('npx', ['tsx', 'server/index.ts'], {
    cwd: root,
    // own process group, so teardown stops tsx and the node process it starts
    detached: true,
    stdio: ['ignore', 'pipe', 'pipe'],
    env: {
      ...process.env,
      NODE_ENV: 'production',
      PORT: String(port),
      DATABASE_URL: path.join(dataDir, 'e2e.db'),
      DATA_DIR: dataDir,
      SEED_DEMO: '1',
      SMTP_URL: '',
      LOG_LEVEL: 'warn',
    },
  });
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-20_000);
  };
  server.stdout?.on('data', keep);
  server.stderr?.on('data', keep);

  const stop = async () => {
    if (server.exitCode !== null || server.pid === undefined) return;
    const exited = new Promise((r) => server.once('exit', r));
    process.kill(-server.pid, 'SIGTERM');
    const timer = setTimeout(() => server.pid && process.kill(-server.pid, 'SIGKILL'), 5000);
    await exited;
    clearTimeout(timer);
  };

  try {
    await waitForHealth(baseURL, server, () => output);
  } catch (error) {
    await stop();
    throw error;
  }
  project.provide('baseURL', baseURL);
  process.env.E2E_BASE_URL = baseURL;

  return async () => {
    await stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}
