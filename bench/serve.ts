// The real server in a process of its own on a loopback port, for benches that time requests as a
// browser or a script on the same machine would make them.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import http from 'node:http';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { generateTrussStation } from '../shared/compute/truss-generator';
import { multipartBody, send } from '../tests/setup/loopback';

import { DEMO_PASSWORD } from '../server/db/seed/demo-users';

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

/** The session cookie of `email` (a demo user). */
export async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

export interface Server {
  base: string;
  process: ChildProcess;
  /** SIGTERM, then wait for the process to end (so the next server has the machine to itself) */
  stop(): Promise<void>;
}

/**
 * `server/index.ts` on a free port with a fresh database (demo seeded), its limiters opened wide
 * (they would turn a bench into a rate-limit test; one person may open any number of live streams) and `env` over the rest. `LOG_LEVEL` is `warn`
 * unless `env` says otherwise; what the server logs goes to this process's output, or is read and
 * dropped with `quiet` (the server still writes every line, as it does behind a log collector).
 */
export async function startLoopbackServer(
  env: Record<string, string> = {},
  { quiet = false }: { quiet?: boolean } = {},
): Promise<Server> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-bench-'));
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      PORT: String(port),
      DATABASE_URL: path.join(dir, 'bench.db'),
      DATA_DIR: dir,
      SEED_DEMO: '1',
      LOG_LEVEL: 'warn',
      API_REQUESTS_PER_MINUTE: '100000000',
      SIGN_IN_ATTEMPTS: '100000000',
      SIGN_IN_ACCOUNT_ATTEMPTS: '100000000',
      // one demo person may open every live stream a bench opens
      EVENT_MAX_STREAMS_PER_USER: '100000',
      ...env,
    },
    stdio: ['ignore', quiet ? 'pipe' : 'inherit', 'inherit'],
  });
  child.stdout?.resume();
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const kill = () => child.kill('SIGTERM');
  process.on('exit', kill);
  const stop = async () => {
    kill();
    await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
    fs.rmSync(dir, { recursive: true, force: true });
  };
  for (let i = 0; i < 300; i++) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return { base, process: child, stop };
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop();
  throw new Error('the server did not start');
}

/** One request on a kept-alive connection: its round trip (ms), status and body as it came (maybe gzipped). */
export function timedRequest(
  agent: http.Agent,
  url: string,
  method: string,
  headers: Record<string, string>,
  body?: string,
): Promise<{ ms: number; status: number; bytes: number; body: Buffer }> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    const chunks: Buffer[] = [];
    const req = http.request(url, { method, agent, headers }, (res) => {
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        const ms = performance.now() - t0;
        const body = Buffer.concat(chunks);
        resolve({ ms, status: res.statusCode ?? 0, bytes: body.length, body });
      });
    });
    req.on('error', reject);
    req.end(body);
  });
}

export const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
};

/** Imports a generated truss station of `nodes` nodes (seed 3) as `cookie`: the document and the new station's id. */
export async function importGeneratedStation(base: string, cookie: string, nodes: number) {
  const doc = generateTrussStation({ nodes, seed: 3 });
  const form = multipartBody([{ field: 'file', fileName: 'station.json', content: JSON.stringify(doc) }]);
  const imported = await send(
    base,
    'POST',
    '/api/stations/import',
    { cookie, 'content-type': form.contentType },
    form.body,
  );
  if (imported.status !== 201) throw new Error(`import: ${imported.status} ${imported.text}`);
  return { doc, stationId: (imported.body.station as { id: number }).id };
}

/** A started server with the 10k station imported: its base, the engineer's cookie and the station. */
export async function serverWithStation(env: Record<string, string>, nodes = 10_000) {
  const server = await startLoopbackServer({ LOG_LEVEL: 'info', ...env }, { quiet: true });
  const engineer = await signIn(server.base, 'engineer@example.org');
  const { doc, stationId } = await importGeneratedStation(server.base, engineer, nodes);
  return { server, engineer, doc, stationId };
}

/**
 * Debian's Chromium, headless with software WebGL as the browser tests run it, in its own profile
 * directory, with the session `cookie` for `base`.
 */
export async function signedInChromium(profile: string, base: string, cookie: string) {
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--use-angle=swiftshader', '--enable-unsafe-swiftshader'],
    viewport: { width: 1360, height: 860 },
  });
  const [name, value] = cookie.split(';')[0].split('=');
  await context.addCookies([{ name, value, url: base }]);
  return context;
}
