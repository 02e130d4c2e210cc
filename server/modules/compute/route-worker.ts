// A route worker thread: compiles stations it is sent and answers findRoute queries, one at a time,
// each as JSON text (the same text res.json would make of it on the main thread).
import { parentPort, workerData } from 'node:worker_threads';
import { compileStation, type CompiledStation } from '@shared/compute/compiled-station';
import type { StationDocument } from '@shared/schemas/station';
import { clipMemory, setClipMemoryBudget } from '@shared/compute/routes-clip';
import { configureClipBuilds, routeMatrixOn, routeOffPath, warmClipGraph } from './clip-builder';
import { HttpError } from '../../lib/http-error';
import { dayOutputOn } from '../plans/plan-day';
import { dayCacheStats, forgetStation } from './day-cache';
import { WORKER_STATIONS, type RouteMessage, type RouteWorkerData, type WorkerReply } from './route-protocol';

if (!parentPort) throw new Error('route-worker.ts runs as a worker thread (see route-pool.ts)');
const port = parentPort;
setClipMemoryBudget((workerData as RouteWorkerData).clipMemoryBytes);
configureClipBuilds({
  inlineNodes: (workerData as RouteWorkerData).clipInlineNodes,
  onEvent: (event) => port.postMessage({ kind: 'clip-build', event } satisfies WorkerReply),
});

interface Held {
  version: number;
  compiled: CompiledStation;
  doc: StationDocument;
}

// keyed by `<database>#<station id>`; one version per station
const held = new Map<string, Held>();

/** What the worker keeps after an answer, reported with it. */
const kept = () => ({ clip: clipMemory(), dayCache: dayCacheStats() });

async function answer(msg: RouteMessage): Promise<WorkerReply> {
  let entry = held.get(msg.station);
  let compiled = false;
  if (!entry || entry.version !== msg.version) {
    if (!msg.doc) return { kind: 'need-document', id: msg.id };
    if (entry) forgetStation(entry.compiled);
    entry = { version: msg.version, compiled: compileStation(msg.doc), doc: msg.doc };
    compiled = true;
  }
  held.delete(msg.station);
  held.set(msg.station, entry);
  while (held.size > WORKER_STATIONS) {
    const oldest = held.keys().next().value!;
    forgetStation(held.get(oldest)!.compiled);
    held.delete(oldest);
  }
  if (msg.warm) {
    const started = warmClipGraph(entry.compiled, entry.doc);
    return { kind: 'result', id: msg.id, json: JSON.stringify({ started }), compiled, ...kept() };
  }
  if (msg.day) {
    const out = await dayOutputOn(entry, msg.day.plan, msg.day.output, msg.day.start, msg.day.extra, {
      run: msg.day.run,
      sequence: msg.day.sequence,
    });
    return 'text' in out
      ? { kind: 'result', id: msg.id, json: out.text, compiled, ...kept() }
      : { kind: 'bytes', id: msg.id, bytes: out.bytes, compiled, ...kept() };
  }
  const result = msg.matrix
    ? routeMatrixOn(entry, msg.matrix)
    : routeOffPath(entry.compiled, entry.doc, msg.request!);
  return { kind: 'result', id: msg.id, json: JSON.stringify(result), compiled, ...kept() };
}

/** An error as it crosses to the main thread; an HttpError (a 4xx the day raises) keeps its code. */
function errorReply(id: number, err: unknown): WorkerReply {
  const e = err instanceof Error ? err : new Error(String(err));
  const http = err instanceof HttpError ? { code: err.code, details: err.details } : {};
  return { kind: 'error', id, error: { name: e.name, message: e.message, stack: e.stack, ...http } };
}

// one message at a time: a day's answer is awaited (a PDF streams) before the next is taken
let queue = Promise.resolve();
port.on('message', (msg: RouteMessage) => {
  queue = queue.then(async () => {
    let reply: WorkerReply;
    try {
      reply = await answer(msg);
    } catch (err) {
      reply = errorReply(msg.id, err);
    }
    if (reply.kind === 'bytes') port.postMessage(reply, [reply.bytes.buffer as ArrayBuffer]);
    else port.postMessage(reply);
  });
});

port.postMessage({ kind: 'ready' } satisfies WorkerReply);
