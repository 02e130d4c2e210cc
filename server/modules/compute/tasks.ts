import type { Transferable } from 'node:worker_threads';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import type { SocketPlanRequest } from '@shared/schemas/sockets';
import {
  importCsvJob,
  importDocumentJob,
  replaceDocumentJob,
  type ImportCsvJob,
  type ImportDocumentJob,
  type ReplaceDocumentJob,
} from '../stations/station-import.service';
import { socketPlanOn } from './compute.service';

/** Where a task finds the app's database: a task worker opens its own connection to the file. */
export interface TaskEnv {
  db(databaseUrl: string): Db;
}

/** Tasks that read or write the database name it, so a worker serving several apps (tests) opens the right one. */
interface OnDatabase {
  databaseUrl: string;
}

/** Every task a task worker runs, by kind: heavy one-off work kept off the request thread. */
export const TASKS = {
  'socket-plan': (input: OnDatabase & { stationId: number; request: SocketPlanRequest }, env: TaskEnv) =>
    socketPlanOn(env.db(input.databaseUrl), input.stationId, input.request),
  'station-import': (input: OnDatabase & ImportDocumentJob, env: TaskEnv) =>
    importDocumentJob(env.db(input.databaseUrl), input),
  'station-replace': (input: OnDatabase & ReplaceDocumentJob, env: TaskEnv) =>
    replaceDocumentJob(env.db(input.databaseUrl), input),
  'station-csv': (input: OnDatabase & ImportCsvJob, env: TaskEnv) =>
    importCsvJob(env.db(input.databaseUrl), input),
};

export type TaskKind = keyof typeof TASKS;
export type TaskInput<K extends TaskKind> = Omit<Parameters<(typeof TASKS)[K]>[0], 'databaseUrl'>;
export type TaskOutput<K extends TaskKind> = Awaited<ReturnType<(typeof TASKS)[K]>>;

/**
 * Runs a task on the app's task pool, or on the main thread when it has none (`TASK_WORKERS=0`).
 * The answer and any error are the same either way: an HttpError from a worker comes back as one.
 */
export async function runTask<K extends TaskKind>(
  ctx: AppContext,
  kind: K,
  input: TaskInput<K>,
  transfer: Transferable[] = [],
): Promise<TaskOutput<K>> {
  const full = { ...input, databaseUrl: ctx.config.databaseUrl };
  if (ctx.taskPool) return (await ctx.taskPool.run(kind, full, transfer)) as TaskOutput<K>;
  const task = TASKS[kind] as (input: unknown, env: TaskEnv) => TaskOutput<K> | Promise<TaskOutput<K>>;
  return task(full, { db: () => ctx.db });
}
