import type { AddressInfo } from 'node:net';
import fs from 'node:fs';
import http, { type Server } from 'node:http';
import type { Express } from 'express';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-users';

/** The app on an ephemeral loopback port, for tests that time real requests. */
export async function listenOnLoopback(app: Express): Promise<{ base: string; server: Server }> {
  const server = app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  return { base: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, server };
}

/** The session cookie of `<who>@example.org`. */
export async function signInCookie(base: string, who: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: `${who}@example.org`, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${who}: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

/**
 * A multipart/form-data body made once, up front, so sending it costs the test's own thread nothing
 * but the socket writes.
 */
export function multipartBody(
  files: { field: string; fileName: string; content: string | Uint8Array }[],
  fields: Record<string, string> = {},
): { body: Buffer; contentType: string } {
  const boundary = `----tetherwise-test-${Math.random().toString(16).slice(2)}`;
  const parts: Buffer[] = [];
  for (const [name, value] of Object.entries(fields))
    parts.push(
      Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`),
    );
  for (const f of files) {
    parts.push(
      Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="${f.field}"; filename="${f.fileName}"\r\n` +
          'Content-Type: application/octet-stream\r\n\r\n',
      ),
      Buffer.from(f.content),
      Buffer.from('\r\n'),
    );
  }
  parts.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}

export interface Answer {
  status: number;
  text: string;
  body: Record<string, unknown>;
}

/**
 * One request with a body made beforehand, over node:http: it writes the bytes as they are (fetch
 * copies a large body first, which would stall the test's own thread and count against the server).
 */
export function send(
  base: string,
  method: string,
  path: string,
  headers: Record<string, string>,
  body: Buffer | string,
): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = http.request(`${base}${path}`, { method, headers, agent: false }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8');
        let parsed: Record<string, unknown> = {};
        try {
          parsed = JSON.parse(text) as Record<string, unknown>;
        } catch {
          // not JSON: the text says what it was
        }
        resolve({ status: res.statusCode ?? 0, text, body: parsed });
      });
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end(body);
  });
}

/**
 * CPU time this process's main thread (the one the app and the test share) has used, ms; null where
 * /proc is not there. Linux counts it in clock ticks of 10 ms.
 */
function mainThreadCpuMs(): number | null {
  try {
    const stat = fs.readFileSync(`/proc/self/task/${process.pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(') ') + 2).split(' ');
    return (Number(fields[11]) + Number(fields[12])) * 10;
  } catch {
    return null;
  }
}

export interface HealthSample {
  /** round trip of GET /api/health, ms */
  wallMs: number;
  /** its status: 200, or what a server that could not answer in time sent (408 from Node's request timeout) */
  status: number;
  /** CPU the request thread used meanwhile, ms (null: not measurable here) */
  threadCpuMs: number | null;
}

export interface Sampled<T> {
  result: T;
  samples: HealthSample[];
  elapsedMs: number;
}

/** At most this many health samples per piece of work, whatever happens to it. */
const MAX_SAMPLES = 3000;
const PAUSE_MS = 20;

/**
 * GET /api/health on a connection of its own: a kept-alive one can be closed by the server's idle
 * timer the moment a long stall ends, under a request already sent (ECONNRESET).
 */
function healthStatus(base: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = http.get(`${base}/api/health`, { agent: false }, (res) => {
      res.resume();
      res.on('end', () => resolve(res.statusCode ?? 0));
      res.on('error', reject);
    });
    req.on('error', reject);
  });
}

/**
 * Runs `work` and samples GET /api/health, one request at a time with a short pause between, until
 * the work settles (or MAX_SAMPLES were taken: a bounded loop). A sample other than 200 throws,
 * unless `keepFailed` (a benchmark counts them instead).
 */
export async function sampleHealthWhile<T>(
  base: string,
  work: () => Promise<T>,
  { keepFailed = false } = {},
): Promise<Sampled<T>> {
  const started = performance.now();
  let settled = false;
  const running = work().finally(() => {
    settled = true;
  });
  const samples: HealthSample[] = [];
  while (!settled && samples.length < MAX_SAMPLES) {
    const cpu0 = mainThreadCpuMs();
    const t0 = performance.now();
    const status = await healthStatus(base);
    const wallMs = performance.now() - t0;
    const cpu1 = mainThreadCpuMs();
    samples.push({ wallMs, status, threadCpuMs: cpu0 === null || cpu1 === null ? null : cpu1 - cpu0 });
    if (status !== 200 && !keepFailed) throw new Error(`/api/health answered ${status}`);
    await new Promise((r) => setTimeout(r, PAUSE_MS));
  }
  const result = await running;
  return { result, samples, elapsedMs: performance.now() - started };
}

/**
 * The samples that took longer than `limitMs` because the request thread was busy: over the limit,
 * and the thread on the CPU for at least half the limit meanwhile. A sample that is slow only because
 * the machine gave the thread no CPU (other processes running) is not the server's doing; on a quiet
 * machine the two measures agree. Without /proc every slow sample counts.
 */
export function blockedSamples(samples: HealthSample[], limitMs: number): HealthSample[] {
  return samples.filter(
    (s) => s.wallMs > limitMs && (s.threadCpuMs === null || s.threadCpuMs >= limitMs / 2),
  );
}
