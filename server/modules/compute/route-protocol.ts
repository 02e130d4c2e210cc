import type { RouteRequest } from '@shared/schemas/route';
import type { StationDocument } from '@shared/schemas/station';
import type { ClipBuildEvent } from './clip-builder';

/** What a route worker starts with. */
export interface RouteWorkerData {
  /** see AppConfig.routeClipInlineNodes */
  clipInlineNodes: number;
}

/** Compiled stations a route worker keeps, least recently used out first (as the main-thread cache). */
export const WORKER_STATIONS = 4;

/**
 * Main thread → worker: one route query. `station` names the station within one database
 * (`<database>#<id>`); `doc` is sent only when the main thread believes the worker does not hold
 * `version` yet.
 */
export interface RouteMessage {
  id: number;
  station: string;
  version: number;
  doc?: StationDocument;
  request: RouteRequest;
}

/** Worker → main thread. */
export type WorkerReply =
  | { kind: 'ready' }
  /** the RouteResult as JSON text: serialised here, the main thread sends it as it is */
  | { kind: 'result'; id: number; json: string; compiled: boolean }
  /** the worker does not hold this version (evicted, or never sent): send the document */
  | { kind: 'need-document'; id: number }
  /** a clip graph built off the request path in this worker finished (or failed) */
  | { kind: 'clip-build'; event: ClipBuildEvent }
  | { kind: 'error'; id: number; error: { name: string; message: string; stack?: string } };
