import type { RouteMatrixRequest, RouteRequest } from '@shared/schemas/route';
import type { DayStart } from '@shared/compute/day/types';
import type { PlanView } from '@shared/schemas/plan-views';
import type { StationDocument } from '@shared/schemas/station';
import type { ClipBuildEvent } from './clip-builder';
import type { DayCacheStats } from './day-cache';
import type { DayExtra, DayOutput } from '../plans/plan-day';
import type { RunWork } from '../runs/run-day';
import type { SequenceWork } from '../plans/plan-sequence';
import type { ErrorCode, ErrorDetail } from '@shared/errors';

/** What a route worker starts with. */
export interface RouteWorkerData {
  /** see AppConfig.routeClipInlineNodes */
  clipInlineNodes: number;
  /** see AppConfig.routeClipMemoryMb, in bytes */
  clipMemoryBytes: number;
}

/** The clip graphs a worker keeps after an answer (see clipMemory in routes-clip). */
export interface ClipMemory {
  graphs: number;
  bytes: number;
  budgetBytes: number;
}

/** What a worker keeps beside its compiled stations, as of an answer. */
export interface WorkerKept {
  clip: ClipMemory;
  /** the routes of the days it computed, and its last few timelines (see day-cache.ts) */
  dayCache: DayCacheStats;
}

/** Compiled stations a route worker keeps, least recently used out first (as the main-thread cache). */
export const WORKER_STATIONS = 4;

/** A plan's day to compute on the worker's station: the timeline as JSON text, or an export of it. */
export interface DayWork {
  plan: PlanView;
  output: DayOutput;
  /** where the day's items start, when an earlier EVA of a series left them somewhere */
  start?: DayStart;
  extra?: DayExtra;
  run?: RunWork;
  sequence?: SequenceWork;
}

/**
 * Main thread → worker: one route query (`request`), a route matrix (`matrix`), one plan's day (`day`)
 * or a warm-up (`warm`). `station` names the
 * station within one database (`<database>#<id>`); `doc` is sent only when the main thread believes
 * the worker does not hold `version` yet.
 */
export interface RouteMessage {
  id: number;
  station: string;
  version: number;
  doc?: StationDocument;
  request?: RouteRequest;
  /** every route between the nodes: a RouteMatrix */
  matrix?: RouteMatrixRequest;
  day?: DayWork;
  /** no query: compile the station and start building its clip graph (see warmClipGraph) */
  warm?: true;
}

/** Worker → main thread. */
export type WorkerReply =
  | { kind: 'ready' }
  /** the answer as text (JSON of a RouteResult or timeline, or CSV), sent by the main thread as it is */
  | ({ kind: 'result'; id: number; json: string; compiled: boolean } & WorkerKept)
  /** a PDF export's bytes */
  | ({ kind: 'bytes'; id: number; bytes: Uint8Array; compiled: boolean } & WorkerKept)
  /** the worker does not hold this version (evicted, or never sent): send the document */
  | { kind: 'need-document'; id: number }
  /** a clip graph built off the request path in this worker finished (or failed) */
  | { kind: 'clip-build'; event: ClipBuildEvent }
  | { kind: 'error'; id: number; error: WorkerError };

/** An error thrown in a worker; an HttpError keeps its code and details (a 4xx stays a 4xx). */
export interface WorkerError {
  name: string;
  message: string;
  stack?: string;
  code?: ErrorCode;
  details?: ErrorDetail[];
}
