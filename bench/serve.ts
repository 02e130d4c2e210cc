// The real server in a process of its own on a loopback port, for benches that time requests as a
// browser or a script on the same machine would make them.
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

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
 * (they would turn a bench into a rate-limit test) and `env` over the rest. `LOG_LEVEL` is `warn`
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
