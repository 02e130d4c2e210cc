import type { Db } from '../../db/client';
import { readStoredUpload, readTextUpload } from '../../lib/uploads';
import { asc, eq } from 'drizzle-orm';
import { stations } from '../../db/schema';
import type { ImportStationPreview, ImportStationResult } from '@shared/schemas/station-edits';
import { importStationCsv } from './station-csv.service';
import {
  docCounts,
  importStation,
  parseStationDocumentText,
  replaceStationModel,
  type Editor,
  type WriteRequest,
} from './stations.service';

/**
 * The station imports as whole jobs on one database connection: read the uploaded bytes as text,
 * parse and check them, and write in one transaction. They run on a task worker with its own
 * connection (a 100k-node document takes seconds to parse, check and write, and no other request
 * waits for it), or on the main thread when the app has no task workers.
 */

/** An uploaded file as a task gets it: its name as sent and the temporary file it was streamed to. */
export interface UploadedFile {
  name: string;
  path: string;
}

const textOf = async (file: UploadedFile, what: string) =>
  readTextUpload(await readStoredUpload(file.path), what);

async function documentOf(file: UploadedFile) {
  return parseStationDocumentText(await textOf(file, 'station document'));
}

export interface ImportDocumentJob {
  file: UploadedFile;
  editor: Editor;
  /** the new station's name in place of the document's (importing an export beside its station) */
  name?: string;
  /** read and check the document and name the stations of the same name; write nothing */
  dryRun?: boolean;
}

export async function importDocumentJob(
  db: Db,
  job: ImportDocumentJob,
): Promise<ImportStationResult | ImportStationPreview> {
  const read = await documentOf(job.file);
  const doc = job.name ? { ...read, name: job.name } : read;
  if (!job.dryRun) return importStation({ db }, doc, job.editor);
  const sameName = db
    .select({ id: stations.id, name: stations.name, version: stations.version })
    .from(stations)
    .where(eq(stations.name, doc.name))
    .orderBy(asc(stations.id))
    .all();
  return { dryRun: true, name: doc.name, counts: docCounts(doc), sameName };
}

export interface ReplaceDocumentJob {
  file: UploadedFile;
  request: WriteRequest;
  /** answer the model the replace would make, writing nothing */
  dryRun?: boolean;
}

export async function replaceDocumentJob(db: Db, job: ReplaceDocumentJob) {
  return replaceStationModel({ db, dryRun: job.dryRun }, job.request, await documentOf(job.file));
}

export interface ImportCsvJob {
  nodes?: UploadedFile;
  edges?: UploadedFile;
  arms?: UploadedFile;
  request: WriteRequest;
  dryRun?: boolean;
}

export async function importCsvJob(db: Db, job: ImportCsvJob) {
  const read = async (file: UploadedFile | undefined, what: string) =>
    file ? { name: file.name, text: await textOf(file, what) } : undefined;
  const files = {
    nodes: await read(job.nodes, 'nodes CSV'),
    edges: await read(job.edges, 'edges CSV'),
    arms: await read(job.arms, 'arms CSV'),
  };
  return importStationCsv({ db, dryRun: job.dryRun }, job.request, files);
}
