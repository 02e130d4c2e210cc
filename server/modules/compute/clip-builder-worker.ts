// A clip-graph builder thread: compiles the station it is given, builds the clip graph for one
// tether length and set of excluded arcs (with the cost landmarks for the station's swap time, so
// the first `balanced` query does not build them), hands the typed arrays over without a copy,
// and ends.
import { parentPort, workerData } from 'node:worker_threads';
import { compileStation } from '@shared/compute/compiled-station';
import { buildClipGraphParts } from '@shared/compute/routes-clip';
import type { ClipBuildJob } from './clip-builder';

if (!parentPort) throw new Error('clip-builder-worker.ts runs as a worker thread (see clip-builder.ts)');
const job = workerData as ClipBuildJob;
const compiled = compileStation(job.doc);
const { parts, transfer } = buildClipGraphParts(
  compiled,
  compiled.arcSeconds,
  job.tetherLengthM,
  job.excludeMask,
  [job.doc.settings.swapSeconds],
);
parentPort.postMessage(parts, transfer);
