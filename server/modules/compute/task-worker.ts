// A task worker thread: runs the tasks of tasks.ts one at a time, each on this thread's own
// connection to the database the task names, and passes station changes on to the main thread.
import { parentPort } from 'node:worker_threads';
import { openDatabase, type DbHandle } from '../../db/client';
import { onStationChanged } from '../stations/stations.service';
import { toTaskError, type TaskMessage, type TaskReply } from './task-protocol';
import { TASKS, type TaskEnv, type TaskKind } from './tasks';

if (!parentPort) throw new Error('task-worker.ts runs as a worker thread (see task-pool.ts)');
const port = parentPort;

const connections = new Map<string, DbHandle>();
const env: TaskEnv = {
  db(databaseUrl) {
    let handle = connections.get(databaseUrl);
    // the app that sent the task has opened and migrated the file already
    if (!handle) connections.set(databaseUrl, (handle = openDatabase(databaseUrl, { migrate: false })));
    return handle.db;
  },
};

onStationChanged((change) => port.postMessage({ kind: 'station-changed', change } satisfies TaskReply));

port.on('message', async (msg: TaskMessage) => {
  let reply: TaskReply;
  try {
    const task = TASKS[msg.kind as TaskKind] as (input: unknown, env: TaskEnv) => unknown;
    if (!task) throw new Error(`unknown task "${msg.kind}"`);
    reply = { kind: 'result', id: msg.id, result: await task(msg.input, env) };
  } catch (err) {
    reply = { kind: 'error', id: msg.id, error: toTaskError(err) };
  }
  port.postMessage(reply);
});

port.postMessage({ kind: 'ready' } satisfies TaskReply);
