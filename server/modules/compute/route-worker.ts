// A route worker thread: compiles stations it is sent and answers findRoute queries, one at a time,
// each as JSON text (the same text res.json would make of it on the main thread).
import { parentPort, workerData } from 'node:worker_threads';
import { compileStation, type CompiledStation } from '@shared/compute/compiled-station';
import type { StationDocument } from '@shared/schemas/station';
import { configureClipBuilds, routeOffPath } from './clip-builder';
import { WORKER_STATIONS, type RouteMessage, type RouteWorkerData, type WorkerReply } from './route-protocol';

if (!parentPort) throw new Error('route-worker.ts runs as a worker thread (see route-pool.ts)');
const port = parentPort;
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

function answer(msg: RouteMessage): WorkerReply {
  let entry = held.get(msg.station);
  let compiled = false;
  if (!entry || entry.version !== msg.version) {
    if (!msg.doc) return { kind: 'need-document', id: msg.id };
    entry = { version: msg.version, compiled: compileStation(msg.doc), doc: msg.doc };
    compiled = true;
  }
  held.delete(msg.station);
  held.set(msg.station, entry);
  while (held.size > WORKER_STATIONS) held.delete(held.keys().next().value!);
  const result = routeOffPath(entry.compiled, entry.doc, msg.request);
  return { kind: 'result', id: msg.id, json: JSON.stringify(result), compiled };
}

port.on('message', (msg: RouteMessage) => {
  let reply: WorkerReply;
  try {
    reply = answer(msg);
  } catch (err) {
    const e = err instanceof Error ? err : new Error(String(err));
    reply = { kind: 'error', id: msg.id, error: { name: e.name, message: e.message, stack: e.stack } };
  }
  port.postMessage(reply);
});

port.postMessage({ kind: 'ready' } satisfies WorkerReply);
