import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import os from 'node:os';
import { CLIP_BUILD_FREE_NODES } from '@shared/compute/routes';
import { DEFAULT_CLIP_MEMORY_BYTES } from '@shared/compute/routes-clip';

export interface AppConfig {
  port: number;
  databaseUrl: string;
  dataDir: string;
  jwtSecret: string;
  smtpUrl: string | null;
  seedDemo: boolean;
  /** the address links in e-mails point to */
  publicOrigin: string;
  cookieSecure: boolean;
  sessionHours: number;
  /** failed sign-ins allowed per window for one e-mail from one address before 429 */
  signInAttempts: number;
  /** failed sign-ins allowed per window for one e-mail from all addresses together before 429 */
  signInAccountAttempts: number;
  signInWindowMs: number;
  /** requests per minute to the API from one address */
  apiRequestsPerMinute: number;
  /** route computations on this many worker threads; 0 → on the main thread */
  routeWorkers: number;
  /** route computations waiting or running in the worker pool at the most before 503 */
  routeQueueLimit: number;
  /** stations up to this many nodes answer small route queries on the main thread, without a worker hop */
  routeInlineNodes: number;
  /** stations up to this many nodes build a clip graph within a route query; larger ones in a builder thread */
  routeClipInlineNodes: number;
  /** clip graphs one thread (each route worker, and the main thread) keeps at the most, MB together */
  routeClipMemoryMb: number;
  /** imports and socket plans on this many worker threads; 0 → on the main thread */
  taskWorkers: number;
  /** tasks waiting or running at the most before 503 */
  taskQueueLimit: number;
  /** heap of a task worker, MB: a task that needs more stops that worker with a 503 */
  taskWorkerHeapMb: number;
  /** Express `trust proxy`: false, a hop count, or addresses/subnets of the proxies */
  trustProxy: boolean | number | string;
  /** a station version keeps its whole document every this many versions (the rest keep changes only) */
  stationSnapshotEvery: number;
  /** the live stream: a heartbeat this often, ms */
  eventHeartbeatMs: number;
  /** recent changes kept to replay to a stream that reconnects */
  eventRingSize: number;
  /** bytes one stream may hold waiting in the server before it is dropped */
  eventClientBufferBytes: number;
  /** live streams open at once, all together and per person */
  eventMaxStreams: number;
  eventMaxStreamsPerUser: number;
  logLevel: string;
  /** folder of the built client; null → API only */
  clientDir: string | null;
  mailFrom: string;
}

function intFromEnv(value: string | undefined, fallback: number): number {
  if (value === undefined || value === '') return fallback;
  const n = Number(value);
  if (!Number.isFinite(n) || n < 0) throw new Error(`expected a non-negative number, got "${value}"`);
  return Math.floor(n);
}

/**
 * TRUST_PROXY: unset, empty, `0` or `false` → no proxy is trusted (the client address is the
 * socket's); a whole number → that many proxies in front; anything else → Express's list of
 * trusted proxy addresses or subnets (`loopback`, `10.0.0.0/8, 192.168.1.7`…). `true` (trust any
 * X-Forwarded-For) is refused: a client could then choose its own address.
 */
export function trustProxyFromEnv(value: string | undefined): boolean | number | string {
  const v = (value ?? '').trim();
  if (v === '' || v === '0' || v.toLowerCase() === 'false') return false;
  if (/^\d+$/.test(v)) return Number(v);
  if (v.toLowerCase() === 'true')
    throw new Error(
      "TRUST_PROXY=true would trust any client's X-Forwarded-For: give the number of proxies or their addresses",
    );
  return v;
}

/**
 * The JWT secret comes from JWT_SECRET, or from a file in the data folder created on first start with
 * owner-only permissions, so sessions survive restarts without a secret in the repo.
 */
export function resolveJwtSecret(dataDir: string, fromEnv: string | undefined): string {
  if (fromEnv) return fromEnv;
  const file = path.join(dataDir, 'jwt-secret');
  try {
    return fs.readFileSync(file, 'utf8').trim();
  } catch {
    const secret = crypto.randomBytes(48).toString('base64url');
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, secret + '\n', { mode: 0o600, flag: 'wx' });
    return secret;
  }
}

/** One route worker per core beyond the one the main thread needs, at most two (README, Performance). */
export function defaultRouteWorkers(cores = os.availableParallelism()): number {
  return Math.max(0, Math.min(2, cores - 1));
}

export function loadConfig(
  env: NodeJS.ProcessEnv = process.env,
  overrides: Partial<AppConfig> = {},
): AppConfig {
  const dataDir = path.resolve(overrides.dataDir ?? env.DATA_DIR ?? 'data');
  fs.mkdirSync(dataDir, { recursive: true });
  const databaseUrl = path.resolve(
    overrides.databaseUrl ?? env.DATABASE_URL ?? path.join('data', 'tetherwise.db'),
  );
  const port = overrides.port ?? intFromEnv(env.PORT, 3000);
  return {
    port,
    databaseUrl,
    dataDir,
    jwtSecret: overrides.jwtSecret ?? resolveJwtSecret(dataDir, env.JWT_SECRET),
    smtpUrl: overrides.smtpUrl !== undefined ? overrides.smtpUrl : env.SMTP_URL || null,
    seedDemo: overrides.seedDemo ?? env.SEED_DEMO !== '0',
    publicOrigin: overrides.publicOrigin ?? env.PUBLIC_ORIGIN ?? `http://localhost:${port}`,
    cookieSecure: overrides.cookieSecure ?? env.COOKIE_SECURE === '1',
    sessionHours: overrides.sessionHours ?? intFromEnv(env.SESSION_HOURS, 12),
    signInAttempts: overrides.signInAttempts ?? intFromEnv(env.SIGN_IN_ATTEMPTS, 10),
    signInAccountAttempts: overrides.signInAccountAttempts ?? intFromEnv(env.SIGN_IN_ACCOUNT_ATTEMPTS, 30),
    signInWindowMs: overrides.signInWindowMs ?? intFromEnv(env.SIGN_IN_WINDOW_MS, 15 * 60 * 1000),
    apiRequestsPerMinute: overrides.apiRequestsPerMinute ?? intFromEnv(env.API_REQUESTS_PER_MINUTE, 1200),
    routeWorkers: overrides.routeWorkers ?? intFromEnv(env.ROUTE_WORKERS, defaultRouteWorkers()),
    routeQueueLimit: overrides.routeQueueLimit ?? intFromEnv(env.ROUTE_QUEUE_LIMIT, 64),
    routeInlineNodes: overrides.routeInlineNodes ?? intFromEnv(env.ROUTE_INLINE_NODES, 20_000),
    routeClipInlineNodes:
      overrides.routeClipInlineNodes ?? intFromEnv(env.ROUTE_CLIP_INLINE_NODES, CLIP_BUILD_FREE_NODES),
    routeClipMemoryMb:
      overrides.routeClipMemoryMb ??
      intFromEnv(env.ROUTE_CLIP_MEMORY_MB, DEFAULT_CLIP_MEMORY_BYTES / 2 ** 20),
    taskWorkers: overrides.taskWorkers ?? intFromEnv(env.TASK_WORKERS, 1),
    taskQueueLimit: overrides.taskQueueLimit ?? intFromEnv(env.TASK_QUEUE_LIMIT, 16),
    taskWorkerHeapMb: overrides.taskWorkerHeapMb ?? intFromEnv(env.TASK_WORKER_HEAP_MB, 2048),
    trustProxy: overrides.trustProxy ?? trustProxyFromEnv(env.TRUST_PROXY),
    stationSnapshotEvery: overrides.stationSnapshotEvery ?? 50,
    eventHeartbeatMs: overrides.eventHeartbeatMs ?? intFromEnv(env.EVENT_HEARTBEAT_MS, 15_000),
    eventRingSize: overrides.eventRingSize ?? 500,
    eventClientBufferBytes: overrides.eventClientBufferBytes ?? 64 * 1024,
    eventMaxStreams: overrides.eventMaxStreams ?? intFromEnv(env.EVENT_MAX_STREAMS, 2000),
    eventMaxStreamsPerUser:
      overrides.eventMaxStreamsPerUser ?? intFromEnv(env.EVENT_MAX_STREAMS_PER_USER, 20),
    logLevel: overrides.logLevel ?? env.LOG_LEVEL ?? 'info',
    clientDir: overrides.clientDir !== undefined ? overrides.clientDir : path.resolve('dist'),
    mailFrom: overrides.mailFrom ?? env.MAIL_FROM ?? 'Tetherwise <no-reply@tetherwise.local>',
  };
}
