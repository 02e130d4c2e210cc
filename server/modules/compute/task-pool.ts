import { Worker, type Transferable } from 'node:worker_threads';
import { unavailable } from '../../lib/http-error';
import type { Logger } from '../../lib/logger';
import type { StationChange } from '../stations/stations.service';
import { fromTaskError, type TaskMessage, type TaskReply } from './task-protocol';

// registers tsx in the thread, then loads the entry named in argv
const BOOT = new URL('./ts-worker-boot.mjs', import.meta.url);
/** A worker that stops before it has started is replaced after this long, not at once. */
const BOOT_FAILURE_DELAY_MS = 1000;

export interface TaskPoolOptions {
  size: number;
  /** tasks waiting or running at the most; one more is refused with 503 */
  queueLimit: number;
  /** heap of each worker, MB: a task that needs more stops that worker (503), not the server */
  maxHeapMb: number;
  logger: Logger;
  /** a station write committed by a task (the main thread's caches and listeners learn of it here) */
  onStationChanged(change: StationChange): void;
}

interface Job {
  id: number;
  kind: string;
  input: unknown;
  transfer: Transferable[];
  resolve(result: unknown): void;
  reject(err: Error): void;
}

interface Slot {
  index: number;
  worker: Worker | null;
  started: boolean;
  running: Job | null;
  done: number;
  restarts: number;
  respawn: NodeJS.Timeout | null;
}

export interface TaskWorkerStats {
  slot: number;
  alive: boolean;
  busy: boolean;
  done: number;
  restarts: number;
}

/**
 * Heavy one-off work on worker threads: station imports (parse, check and write on the worker's own
 * database connection) and socket plans. One task at a time per worker, the rest wait in order;
 * more than `queueLimit` waiting or running is 503. A worker that stops (a crash, or a task past
 * its heap limit) fails its task with 503 and is replaced. Workers start on the first task.
 */
export class TaskPool {
  private readonly slots: Slot[];
  private readonly queue: Job[] = [];
  private nextId = 1;
  private started = false;
  private closing = false;

  constructor(private readonly options: TaskPoolOptions) {
    if (!(options.size >= 1)) throw new Error('a task pool needs at least one worker');
    this.slots = Array.from({ length: options.size }, (_, index) => ({
      index,
      worker: null,
      started: false,
      running: null,
      done: 0,
      restarts: 0,
      respawn: null,
    }));
  }

  /** Tasks waiting or running. */
  get pending(): number {
    return this.queue.length + this.slots.filter((s) => s.running).length;
  }

  stats(): TaskWorkerStats[] {
    return this.slots.map((s) => ({
      slot: s.index,
      alive: s.worker !== null,
      busy: s.running !== null,
      done: s.done,
      restarts: s.restarts,
    }));
  }

  run(kind: string, input: unknown, transfer: Transferable[] = []): Promise<unknown> {
    if (this.closing) return Promise.reject(unavailable('The server is shutting down.'));
    if (!this.started) {
      this.started = true;
      for (const slot of this.slots) this.spawn(slot);
    }
    if (this.pending >= this.options.queueLimit)
      return Promise.reject(
        unavailable('The server is busy with other large jobs. Try again in a moment.', 5),
      );
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, kind, input, transfer, resolve, reject });
      this.dispatch();
    });
  }

  /** Stops a worker as if it had crashed (for tests); the pool replaces it. */
  async terminateWorker(slotIndex: number): Promise<void> {
    await this.slots[slotIndex]?.worker?.terminate();
  }

  async close(): Promise<void> {
    this.closing = true;
    for (const job of this.queue.splice(0)) job.reject(unavailable('The server is shutting down.'));
    const stopping: Promise<number>[] = [];
    for (const slot of this.slots) {
      if (slot.respawn) clearTimeout(slot.respawn);
      this.fail(slot, 'The server is shutting down.');
      if (slot.worker) stopping.push(slot.worker.terminate());
    }
    await Promise.all(stopping);
  }

  private dispatch() {
    for (const slot of this.slots) {
      if (this.queue.length === 0) return;
      if (!slot.worker || slot.running) continue;
      const job = this.queue.shift()!;
      slot.running = job;
      const msg: TaskMessage = { id: job.id, kind: job.kind, input: job.input };
      slot.worker.postMessage(msg, job.transfer);
    }
  }

  private spawn(slot: Slot) {
    slot.respawn = null;
    const worker = new Worker(BOOT, {
      argv: ['./task-worker.ts'],
      execArgv: [],
      name: `task-worker-${slot.index}`,
      resourceLimits: { maxOldGenerationSizeMb: this.options.maxHeapMb },
    });
    worker.unref();
    slot.worker = worker;
    slot.started = false;
    worker.on('message', (reply: TaskReply) => this.onReply(slot, reply));
    worker.on('error', (err) => this.options.logger.error({ err, worker: slot.index }, 'task worker failed'));
    worker.on('exit', (code) => this.onExit(slot, worker, code));
  }

  private onReply(slot: Slot, reply: TaskReply) {
    if (reply.kind === 'ready') {
      slot.started = true;
      this.dispatch();
      return;
    }
    if (reply.kind === 'station-changed') {
      this.options.onStationChanged(reply.change);
      return;
    }
    const job = slot.running;
    if (!job || job.id !== reply.id) return;
    slot.running = null;
    slot.done++;
    if (reply.kind === 'result') job.resolve(reply.result);
    else job.reject(fromTaskError(reply.error));
    this.dispatch();
  }

  private onExit(slot: Slot, worker: Worker, code: number) {
    if (slot.worker !== worker) return;
    slot.worker = null;
    if (this.closing) return;
    this.fail(
      slot,
      'The job stopped before it finished (it may have needed more memory than allowed). Nothing was saved.',
    );
    slot.restarts++;
    const delay = slot.started ? 0 : BOOT_FAILURE_DELAY_MS;
    // a worker that cannot start would leave the queue waiting for ever
    if (!slot.started && this.slots.every((s) => !s.started))
      for (const job of this.queue.splice(0))
        job.reject(unavailable('No task worker is running. Try again in a moment.'));
    this.options.logger.error(
      { worker: slot.index, code, restartInMs: delay },
      'task worker stopped; starting another',
    );
    if (delay === 0) this.spawn(slot);
    else slot.respawn = setTimeout(() => this.spawn(slot), delay).unref();
  }

  private fail(slot: Slot, message: string) {
    const job = slot.running;
    slot.running = null;
    job?.reject(unavailable(message));
  }
}
