// A clip-graph builder thread: compiles the station it is given, builds the clip graph for one
// tether length and set of excluded arcs (with the cost landmarks for the station's swap time, and
// for it over the carry factor, which a leg carrying a large item searches with, so neither the
// first `balanced` query nor the first carrying one builds them), hands the typed arrays over
// without a copy, and ends.
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
  [job.doc.settings.swapSeconds, job.doc.settings.swapSeconds / job.doc.settings.carryFactor],
);
parentPort.postMessage(parts, transfer);
