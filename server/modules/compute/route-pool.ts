import { Worker } from 'node:worker_threads';
import { CLIP_BUILD_FREE_NODES } from '@shared/compute/routes';
import { DEFAULT_CLIP_MEMORY_BYTES } from '@shared/compute/routes-clip';
import type { RouteMatrixRequest, RouteRequest } from '@shared/schemas/route';
import type { StationDocument } from '@shared/schemas/station';
import { HttpError, unavailable } from '../../lib/http-error';
import type { Logger } from '../../lib/logger';
import { logClipBuild } from './clip-builder';
import { emptyDayCache, type DayCacheStats } from './day-cache';
import {
  WORKER_STATIONS,
  type DayWork,
  type RouteMessage,
  type RouteWorkerData,
  type WorkerError,
  type WorkerReply,
  type ClipMemory,
} from './route-protocol';

// registers tsx in the thread, then loads the entry named in argv
const BOOT = new URL('./ts-worker-boot.mjs', import.meta.url);

/**
 * A station's holder with this many queries in flight (one running, one waiting) hands the next
 * query to an idle worker instead, which compiles the station too.
 */
const SPILL_AT = 2;
/** A worker that stops before it has started is replaced after this long, not at once. */
const BOOT_FAILURE_DELAY_MS = 1000;

interface StationJob {
  /** the station within one database: `<database>#<station id>` */
  station: string;
  version: number;
  doc: StationDocument;
}

export interface RouteJob extends StationJob {
  request: RouteRequest;
}

/** Every route between some nodes of the station. */
export interface MatrixJob extends StationJob {
  matrix: RouteMatrixRequest;
}

/** A plan's day on the station: its timeline as JSON text, or an export (CSV text, PDF bytes). */
export interface DayJob extends StationJob, DayWork {}

/** No query: the worker compiles the station and starts building its clip graph (see warmClipGraph). */
export interface WarmJob extends StationJob {
  warm: true;
}

type Job = RouteJob | MatrixJob | DayJob | WarmJob;

export interface RoutePoolOptions {
  size: number;
  /** route queries waiting or running in the pool at the most; one more is refused with 503 */
  queueLimit: number;
  /** see AppConfig.routeClipInlineNodes (default CLIP_BUILD_FREE_NODES) */
  clipInlineNodes?: number;
  /** see AppConfig.routeClipMemoryMb, in bytes (default DEFAULT_CLIP_MEMORY_BYTES) */
  clipMemoryBytes?: number;
  logger: Logger;
}

export interface RouteWorkerStats {
  slot: number;
  alive: boolean;
  inFlight: number;
  /** station versions compiled by this slot's workers */
  compiles: number;
  answered: number;
  /** workers that stopped unexpectedly and were replaced */
  restarts: number;
  /** clip graphs this slot's workers built off the request path and now use */
  clipBuilds: number;
  /** clip graphs the worker keeps, their bytes and its budget for them, as of its last answer */
  clip: ClipMemory;
  /** the day routes and timelines the worker keeps, and how often they were reused, as of its last answer */
  dayCache: DayCacheStats;
}

interface Pending {
  job: Job;
  resolve(result: { text: string } | { bytes: Uint8Array }): void;
  reject(err: Error): void;
}

interface Slot {
  index: number;
  worker: Worker | null;
  /** whether the current worker has started (answered `ready`) */
  started: boolean;
  inFlight: Map<number, Pending>;
  /** what the worker holds, as far as the main thread knows: station → version, least recent first */
  held: Map<string, number>;
  compiles: number;
  answered: number;
  restarts: number;
  clipBuilds: number;
  clip: ClipMemory;
  dayCache: DayCacheStats;
  respawn: NodeJS.Timeout | null;
}

/**
 * An error thrown inside a worker, rebuilt on the main thread: an HttpError as itself, anything else
 * as an Error (the error handler logs it and sends 500).
 */
function workerError(e: WorkerError): Error {
  if (e.code) return new HttpError(e.code, e.message, e.details);
  const err = new Error(e.message);
  err.name = e.name;
  if (e.stack) err.stack = e.stack;
  return err;
}

/**
 * Route queries on worker threads. Each worker keeps the compiled index of the stations it has
 * been sent; a query goes to a worker that holds its station version (the least busy of them),
 * unless that one is busy and another is idle, so a station is compiled by one worker until its
 * load needs more. Workers start on the first query. A worker that stops fails its queries with
 * 503 and is replaced; more than `queueLimit` queries at once are refused with 503.
 */
export class RoutePool {
  private readonly slots: Slot[];
  private nextId = 1;
  private closing = false;
  private started = false;

  constructor(private readonly options: RoutePoolOptions) {
    if (!(options.size >= 1)) throw new Error('a route pool needs at least one worker');
    this.slots = Array.from({ length: options.size }, (_, index) => ({
      index,
      worker: null,
      started: false,
      inFlight: new Map(),
      held: new Map(),
      compiles: 0,
      answered: 0,
      restarts: 0,
      clipBuilds: 0,
      clip: { graphs: 0, bytes: 0, budgetBytes: options.clipMemoryBytes ?? DEFAULT_CLIP_MEMORY_BYTES },
      dayCache: emptyDayCache(),
      respawn: null,
    }));
  }

  get size(): number {
    return this.slots.length;
  }

  /** Queries sent to a worker and not answered yet. */
  get pending(): number {
    return this.slots.reduce((n, s) => n + s.inFlight.size, 0);
  }

  stats(): RouteWorkerStats[] {
    return this.slots.map((s) => ({
      slot: s.index,
      alive: s.worker !== null,
      inFlight: s.inFlight.size,
      compiles: s.compiles,
      answered: s.answered,
      restarts: s.restarts,
      clipBuilds: s.clipBuilds,
      clip: { ...s.clip },
      dayCache: structuredClone(s.dayCache),
    }));
  }

  /** The route for `job` as the JSON text of its RouteResult. */
  async route(job: RouteJob): Promise<string> {
    const result = await this.run(job);
    return 'text' in result ? result.text : '';
  }

  /** A route matrix as the JSON text of its RouteMatrix. */
  async matrix(job: MatrixJob): Promise<string> {
    const result = await this.run(job);
    return 'text' in result ? result.text : '';
  }

  /** A plan's day: the timeline as JSON text, or an export (CSV text, PDF bytes). */
  day(job: DayJob): Promise<{ text: string } | { bytes: Uint8Array }> {
    return this.run(job);
  }

  /** Compiles the station in a worker and starts its clip graph's build there; whether one started. */
  async warm(job: StationJob): Promise<boolean> {
    const result = await this.run({ ...job, warm: true });
    return 'text' in result && (JSON.parse(result.text) as { started: boolean }).started;
  }

  private async run(job: Job): Promise<{ text: string } | { bytes: Uint8Array }> {
    if (this.closing) throw unavailable('The server is shutting down.');
    if (!this.started) {
      this.started = true;
      for (const slot of this.slots) this.spawn(slot);
    }
    if (this.pending >= this.options.queueLimit) {
      throw unavailable('Too many route computations are waiting. Try again in a moment.');
    }
    const slot = this.choose(job);
    if (!slot) throw unavailable('No route worker is running. Try again in a moment.');
    return new Promise((resolve, reject) => {
      const id = this.nextId++;
      slot.inFlight.set(id, { job, resolve, reject });
      this.send(slot, id, job, !this.holds(slot, job));
    });
  }

  /** Stops a worker as if it had crashed (for tests); the pool replaces it. */
  async terminateWorker(slotIndex: number): Promise<void> {
    await this.slots[slotIndex]?.worker?.terminate();
  }

  async close(): Promise<void> {
    this.closing = true;
    const stopping: Promise<number>[] = [];
    for (const slot of this.slots) {
      if (slot.respawn) clearTimeout(slot.respawn);
      this.failInFlight(slot, 'The server is shutting down.');
      if (slot.worker) stopping.push(slot.worker.terminate());
    }
    await Promise.all(stopping);
  }

  private holds(slot: Slot, job: Job): boolean {
    return slot.held.get(job.station) === job.version;
  }

  private choose(job: Job): Slot | null {
    const live = this.slots.filter((s) => s.worker !== null);
    if (live.length === 0) return null;
    const leastBusy = (list: Slot[]) => list.reduce((a, b) => (b.inFlight.size < a.inFlight.size ? b : a));
    const holders = live.filter((s) => this.holds(s, job));
    if (holders.length > 0) {
      const holder = leastBusy(holders);
      const idle = live.find((s) => s.inFlight.size === 0);
      return holder.inFlight.size >= SPILL_AT && idle ? idle : holder;
    }
    // no worker holds it: the least busy one, ties spread by station so stations land apart
    const start = [...job.station].reduce((h, ch) => (h * 31 + ch.charCodeAt(0)) >>> 0, 0) % live.length;
    return leastBusy([...live.slice(start), ...live.slice(0, start)]);
  }

  private send(slot: Slot, id: number, job: Job, withDocument: boolean) {
    const msg: RouteMessage = {
      id,
      station: job.station,
      version: job.version,
      ...('request' in job
        ? { request: job.request }
        : 'matrix' in job
          ? { matrix: job.matrix }
          : 'warm' in job
            ? { warm: true as const }
            : {
                day: {
                  plan: job.plan,
                  output: job.output,
                  start: job.start,
                  extra: job.extra,
                  ...(job.run ? { run: job.run } : {}),
                  ...(job.sequence ? { sequence: job.sequence } : {}),
                },
              }),
    };
    if (withDocument) msg.doc = job.doc;
    slot.held.delete(job.station);
    slot.held.set(job.station, job.version);
    while (slot.held.size > WORKER_STATIONS) slot.held.delete(slot.held.keys().next().value!);
    slot.worker!.postMessage(msg);
  }

  private spawn(slot: Slot) {
    slot.respawn = null;
    const worker = new Worker(BOOT, {
      argv: ['./route-worker.ts'],
      workerData: {
        clipInlineNodes: this.options.clipInlineNodes ?? CLIP_BUILD_FREE_NODES,
        clipMemoryBytes: this.options.clipMemoryBytes ?? DEFAULT_CLIP_MEMORY_BYTES,
      } satisfies RouteWorkerData,
      execArgv: [],
      name: `route-worker-${slot.index}`,
    });
    worker.unref();
    slot.worker = worker;
    slot.started = false;
    slot.held.clear();
    slot.dayCache = emptyDayCache();
    worker.on('message', (reply: WorkerReply) => this.onReply(slot, reply));
    worker.on('error', (err) =>
      this.options.logger.error({ err, worker: slot.index }, 'route worker failed'),
    );
    worker.on('exit', (code) => this.onExit(slot, worker, code));
  }

  private onReply(slot: Slot, reply: WorkerReply) {
    if (reply.kind === 'ready') {
      slot.started = true;
      return;
    }
    if (reply.kind === 'clip-build') {
      if (reply.event.ok) slot.clipBuilds++;
      logClipBuild(this.options.logger, reply.event, slot.index);
      return;
    }
    const pending = slot.inFlight.get(reply.id);
    if (!pending) return;
    if (reply.kind === 'need-document') {
      this.send(slot, reply.id, pending.job, true);
      return;
    }
    slot.inFlight.delete(reply.id);
    slot.answered++;
    if (reply.kind === 'result' || reply.kind === 'bytes') {
      if (reply.compiled) slot.compiles++;
      slot.clip = reply.clip;
      slot.dayCache = reply.dayCache;
      pending.resolve(reply.kind === 'result' ? { text: reply.json } : { bytes: reply.bytes });
    } else {
      pending.reject(workerError(reply.error));
    }
  }

  private onExit(slot: Slot, worker: Worker, code: number) {
    if (slot.worker !== worker) return;
    slot.worker = null;
    slot.held.clear();
    if (this.closing) return;
    this.failInFlight(slot, 'The route computation stopped unexpectedly. Try again.');
    slot.restarts++;
    const delay = slot.started ? 0 : BOOT_FAILURE_DELAY_MS;
    this.options.logger.error(
      { worker: slot.index, code, restartInMs: delay },
      'route worker stopped; starting another',
    );
    if (delay === 0) this.spawn(slot);
    else slot.respawn = setTimeout(() => this.spawn(slot), delay).unref();
  }

  private failInFlight(slot: Slot, message: string) {
    const failed = [...slot.inFlight.values()];
    slot.inFlight.clear();
    for (const p of failed) p.reject(unavailable(message));
  }
}
