import { and, asc, count, desc, eq, isNotNull, sql } from 'drizzle-orm';
import type { BaseSQLiteDatabase, SQLiteTable } from 'drizzle-orm/sqlite-core';
import type { RunResult } from 'better-sqlite3';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import * as schema from '../../db/schema';
import {
  annotations,
  attachments,
  edges,
  hazards,
  nodes,
  plans,
  segments,
  stationAudit,
  stationVersions,
  stations,
  users,
} from '../../db/schema';
import { removeStoredUpload } from '../../lib/uploads';
import { HttpError, badRequest, conflict, notFound, staleVersion } from '../../lib/http-error';
import { recordActivity } from '../activity/activity.service';
import {
  diffStationDocuments,
  emptyStationDocument,
  summarizeStationChange,
  type StationChange as ModelChange,
} from '@shared/compute/station-changes';
import { applyValidChange, changeProblems } from '@shared/compute/station-validation';
import { toGraphColumns } from '@shared/compute/graph-columns';
import {
  StationSettingsSchema,
  parseStationDocument,
  type Arm,
  type DocumentProblem,
  type Hazard,
  type Segment,
  type StationDocument,
  type StationEdge,
  type StationNode,
  type Vec3,
} from '@shared/schemas/station';
import type {
  GraphEdge,
  ImportStationResult,
  StationAuditEntry,
  StationCounts,
  StationGraph,
  StationSummary,
} from '@shared/schemas/station-edits';

/** The database or a transaction on it: every reader here works inside a write's transaction too. */
export type Tx = BaseSQLiteDatabase<'sync', RunResult, typeof schema>;
export type StationRow = typeof stations.$inferSelect;
export interface Editor {
  id: number;
  name: string;
}
/**
 * What a station write needs of the app: its database (the app's own, or a task worker's
 * connection), and how often a version keeps the whole document (default 50).
 */
export type DbContext = Pick<AppContext, 'db'> & {
  config?: Partial<Pick<AppContext['config'], 'stationSnapshotEvery'>>;
  /** run the write and answer the model it would make, then roll it back: nothing is written */
  dryRun?: boolean;
};

/** What a dry-run write answers: the station document the write would have made, from which version. */
export interface DryRunAnswer {
  dryRun: true;
  version: number;
  document: StationDocument;
}
export const isDryRun = (r: object): r is DryRunAnswer => (r as Partial<DryRunAnswer>).dryRun === true;
/** The answer of a write that is never a dry run. */
export function notDryRun<T extends object>(r: T | DryRunAnswer): T {
  if (isDryRun(r)) throw new Error('internal: a write answered a dry run nobody asked for');
  return r;
}
class DryRunRollback extends Error {
  constructor(readonly answer: DryRunAnswer) {
    super('dry run: rolled back');
  }
}
const snapshotEvery = (ctx: DbContext) => ctx.config?.stationSnapshotEvery ?? 50;

// ── Change notifications ────────────────────────────────────────────────────────────────────────

export interface StationChange {
  stationId: number;
  version: number;
}
const listeners = new Set<(change: StationChange) => void>();

/**
 * Called after every committed write to a station model with its new version, so caches keyed by
 * (stationId, version), such as compiled route indexes, can drop the old entry. Returns an unsubscribe.
 */
export function onStationChanged(listener: (change: StationChange) => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** Tells the listeners of this thread; a task worker's writes are passed on by the task pool. */
export function emitStationChanged(change: StationChange) {
  for (const l of listeners) l(change);
}

// ── Rows ↔ document items ───────────────────────────────────────────────────────────────────────

const opt = <K extends string, V>(key: K, value: V | null | undefined) =>
  (value === null || value === undefined ? {} : { [key]: value }) as { [P in K]?: V };

export function nodeFromRow(r: typeof nodes.$inferSelect): StationNode {
  return {
    key: r.key,
    kind: r.kind,
    ...opt('label', r.label),
    position: [r.x, r.y, r.z],
    ...(r.nx !== null && r.ny !== null && r.nz !== null ? { normal: [r.nx, r.ny, r.nz] as Vec3 } : {}),
    ...opt('notes', r.notes),
  };
}

export function nodeToRow(stationId: number, n: StationNode, ord: number) {
  return {
    stationId,
    key: n.key,
    kind: n.kind,
    label: n.label ?? null,
    x: n.position[0],
    y: n.position[1],
    z: n.position[2],
    nx: n.normal?.[0] ?? null,
    ny: n.normal?.[1] ?? null,
    nz: n.normal?.[2] ?? null,
    notes: n.notes ?? null,
    ord,
  };
}

export function edgeFromRow(r: typeof edges.$inferSelect): StationEdge {
  return {
    from: r.fromKey,
    to: r.toKey,
    kind: r.kind,
    ...opt('lengthM', r.lengthM),
    ...(r.closed ? { closed: true } : {}),
    ...opt('label', r.label),
  };
}

export function edgeToRow(stationId: number, e: StationEdge, ord: number) {
  return {
    stationId,
    fromKey: e.from,
    toKey: e.to,
    kind: e.kind,
    lengthM: e.lengthM ?? null,
    closed: e.closed ?? false,
    label: e.label ?? null,
    ord,
  };
}

export function hazardFromRow(r: typeof hazards.$inferSelect): Hazard {
  return { key: r.key, kind: r.kind, ...opt('label', r.label), ...JSON.parse(r.shapeJson) } as Hazard;
}

export function hazardToRow(stationId: number, h: Hazard, ord: number) {
  const shape =
    h.shape === 'sphere'
      ? { shape: h.shape, center: h.center, radiusM: h.radiusM }
      : { shape: h.shape, min: h.min, max: h.max };
  return {
    stationId,
    key: h.key,
    kind: h.kind,
    label: h.label ?? null,
    shapeJson: JSON.stringify(shape),
    ord,
  };
}

export function segmentFromRow(r: typeof segments.$inferSelect): Segment {
  return {
    key: r.key,
    ...opt('label', r.label),
    kind: r.kind,
    center: [r.cx, r.cy, r.cz],
    size: [r.sx, r.sy, r.sz],
    ...(r.hasRotation ? { rotationDeg: [r.rx, r.ry, r.rz] as Vec3 } : {}),
  };
}

export function segmentToRow(stationId: number, s: Segment, ord: number) {
  const [rx, ry, rz] = s.rotationDeg ?? [0, 0, 0];
  return {
    stationId,
    key: s.key,
    label: s.label ?? null,
    kind: s.kind,
    cx: s.center[0],
    cy: s.center[1],
    cz: s.center[2],
    sx: s.size[0],
    sy: s.size[1],
    sz: s.size[2],
    rx,
    ry,
    rz,
    hasRotation: s.rotationDeg !== undefined,
    ord,
  };
}

// ── Reading ─────────────────────────────────────────────────────────────────────────────────────

export function findStationRow(db: Tx, id: number): StationRow {
  const row = db.select().from(stations).where(eq(stations.id, id)).get();
  if (!row) throw notFound('Station');
  return row;
}

function countsOf(db: Tx, stationId: number): StationCounts {
  const n = (table: typeof nodes | typeof edges | typeof hazards | typeof segments) =>
    db.select({ n: count() }).from(table).where(eq(table.stationId, stationId)).get()?.n ?? 0;
  return { nodes: n(nodes), edges: n(edges), hazards: n(hazards), segments: n(segments) };
}

export function userRef(db: Tx, id: number | null) {
  if (id === null) return null;
  return db.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, id)).get() ?? null;
}

function toSummary(db: Tx, row: StationRow): StationSummary {
  return {
    id: row.id,
    name: row.name,
    version: row.version,
    orbit: { altitudeKm: row.altitudeKm, betaDeg: row.betaDeg },
    settings: StationSettingsSchema.parse(JSON.parse(row.settingsJson)),
    counts: countsOf(db, row.id),
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    updatedBy: userRef(db, row.updatedBy),
  };
}

export function listStations(db: Db): StationSummary[] {
  return db
    .select()
    .from(stations)
    .orderBy(asc(stations.name), asc(stations.id))
    .all()
    .map((r) => toSummary(db, r));
}

export function getStation(db: Db, id: number): StationSummary {
  return toSummary(db, findStationRow(db, id));
}

export function getStationVersion(db: Db, id: number): number {
  return findStationRow(db, id).version;
}

function loadRows(db: Tx, stationId: number) {
  return {
    segments: db
      .select()
      .from(segments)
      .where(eq(segments.stationId, stationId))
      .orderBy(asc(segments.ord), asc(segments.id))
      .all(),
    nodes: db
      .select()
      .from(nodes)
      .where(eq(nodes.stationId, stationId))
      .orderBy(asc(nodes.ord), asc(nodes.id))
      .all(),
    edges: db
      .select()
      .from(edges)
      .where(eq(edges.stationId, stationId))
      .orderBy(asc(edges.ord), asc(edges.id))
      .all(),
    hazards: db
      .select()
      .from(hazards)
      .where(eq(hazards.stationId, stationId))
      .orderBy(asc(hazards.ord), asc(hazards.id))
      .all(),
  };
}

/** The station as a document (the export format); edges carry `lengthM` only where it was given. */
function loadDocumentHeader(row: StationRow) {
  return {
    format: 'tetherwise.station' as const,
    version: 1 as const,
    name: row.name,
    orbit: { altitudeKm: row.altitudeKm, betaDeg: row.betaDeg },
    settings: StationSettingsSchema.parse(JSON.parse(row.settingsJson)),
  };
}

export function loadDocument(db: Tx, row: StationRow): StationDocument {
  const rows = loadRows(db, row.id);
  return {
    ...loadDocumentHeader(row),
    segments: rows.segments.map(segmentFromRow),
    nodes: rows.nodes.map(nodeFromRow),
    edges: rows.edges.map(edgeFromRow),
    hazards: rows.hazards.map(hazardFromRow),
    arms: armsOf(row),
  };
}

/** The station's arms as stored (checked against the document rules whenever they were written). */
export function armsOf(row: Pick<StationRow, 'armsJson'>): Arm[] {
  return JSON.parse(row.armsJson) as Arm[];
}

/** The full, parsed station document, for computations that compile the graph (e.g. routes). */
export function getStationDocument(db: Db, id: number): StationDocument {
  return db.transaction((tx) => loadDocument(tx, findStationRow(tx, id)));
}

/** The document together with the version it was read at, read in one transaction. */
export function getStationSnapshot(
  db: Db,
  id: number,
): { stationId: number; version: number; document: StationDocument } {
  return db.transaction((tx) => {
    const row = findStationRow(tx, id);
    return { stationId: id, version: row.version, document: loadDocument(tx, row) };
  });
}

/**
 * The graph endpoint's JSON, serialised once per station version: every write bumps the version,
 * so a cached body is never stale, and the 3D view's many readers cost one query each. The columns
 * (`toGraphColumns`, what the Station screen reads) are cached the same way.
 */
const graphJsonCache = new WeakMap<Db, Map<string, { version: number; json: string }>>();

export function getStationGraphJson(
  db: Db,
  id: number,
  shape: 'objects' | 'columns' = 'objects',
): { version: number; json: string } {
  const version = getStationVersion(db, id);
  let cache = graphJsonCache.get(db);
  if (!cache) graphJsonCache.set(db, (cache = new Map()));
  const key = `${id}:${shape}`;
  const hit = cache.get(key);
  if (hit && hit.version === version) return hit;
  const graph = getStationGraph(db, id);
  const entry = {
    version: graph.station.version,
    json: JSON.stringify(shape === 'columns' ? toGraphColumns(graph) : graph),
  };
  cache.set(key, entry);
  return entry;
}

export function getStationGraph(db: Db, id: number): StationGraph {
  return db.transaction((tx) => {
    const row = findStationRow(tx, id);
    const rows = loadRows(tx, id);
    const doc: StationDocument = {
      ...loadDocumentHeader(row),
      segments: rows.segments.map(segmentFromRow),
      nodes: rows.nodes.map(nodeFromRow),
      edges: rows.edges.map(edgeFromRow),
      hazards: rows.hazards.map(hazardFromRow),
      arms: armsOf(row),
    };
    return graphOf(
      row,
      doc,
      userRef(tx, row.updatedBy),
      rows.edges.map((r) => r.id),
    );
  });
}

/**
 * The graph view of a station document: edges with their lengths resolved (given, or from the node
 * positions) and an id each (the row's, or the edge's place in the list when `edgeIds` is absent).
 */
export function graphOf(
  row: StationRow,
  doc: StationDocument,
  updatedBy: { id: number; name: string } | null,
  edgeIds?: readonly number[],
): StationGraph {
  const positions = new Map(doc.nodes.map((n) => [n.key, n.position]));
  const graphEdges: GraphEdge[] = doc.edges.map((e, i) => {
    const a = positions.get(e.from);
    const b = positions.get(e.to);
    const derived = a && b ? Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]) : 0;
    return {
      id: edgeIds?.[i] ?? i + 1,
      from: e.from,
      to: e.to,
      kind: e.kind,
      lengthM: e.lengthM ?? derived,
      lengthGiven: e.lengthM !== undefined,
      closed: e.closed ?? false,
      ...opt('label', e.label),
    };
  });
  return {
    station: {
      id: row.id,
      name: row.name,
      version: row.version,
      orbit: { altitudeKm: row.altitudeKm, betaDeg: row.betaDeg },
      settings: StationSettingsSchema.parse(JSON.parse(row.settingsJson)),
      counts: docCounts(doc),
      createdAt: row.createdAt,
      updatedAt: row.updatedAt,
      updatedBy,
    },
    segments: doc.segments,
    nodes: doc.nodes,
    edges: graphEdges,
    hazards: doc.hazards,
    arms: doc.arms,
  };
}

export function exportStationDocument(db: Db, id: number): { fileName: string; document: StationDocument } {
  const document = getStationDocument(db, id);
  const base = document.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'station';
  return { fileName: `${base}.tetherwise.json`, document };
}

// ── Versions kept ──

interface RecordVersion {
  /**
   * a whole document is kept with every this many versions, so reading a version back applies at
   * most this many changes to the snapshot before it
   */
  snapshotEvery: number;
  stationId: number;
  version: number;
  action: string;
  userId: number | null;
  change: ModelChange;
  /** the document as the version leaves it (called only when a snapshot is due) */
  document: () => StationDocument;
}

/** Stores a new version's change; never touches an existing row (a version is written once). */
export function recordStationVersion(tx: Tx, v: RecordVersion) {
  const lastSnapshot =
    tx
      .select({ version: stationVersions.version })
      .from(stationVersions)
      .where(and(eq(stationVersions.stationId, v.stationId), isNotNull(stationVersions.snapshotJson)))
      .orderBy(desc(stationVersions.version))
      .get()?.version ?? firstKeptVersion(tx, v.stationId);
  const due = lastSnapshot !== null && v.version - lastSnapshot >= v.snapshotEvery;
  tx.insert(stationVersions)
    .values({
      stationId: v.stationId,
      version: v.version,
      action: v.action,
      userId: v.userId,
      changeJson: JSON.stringify(v.change),
      summaryJson: JSON.stringify(summarizeStationChange(v.change)),
      snapshotJson: due ? JSON.stringify(v.document()) : null,
    })
    .run();
}

export function firstKeptVersion(tx: Tx, stationId: number): number | null {
  return (
    tx
      .select({ version: stationVersions.version })
      .from(stationVersions)
      .where(eq(stationVersions.stationId, stationId))
      .orderBy(asc(stationVersions.version))
      .get()?.version ?? null
  );
}

/**
 * A station whose history is not kept yet (it was made before versions were kept) starts it at its
 * current version: the whole model, as a change from an empty station.
 */
export function ensureVersionBaseline(tx: Tx, row: StationRow) {
  if (firstKeptVersion(tx, row.id) !== null) return;
  const change = diffStationDocuments(emptyStationDocument(), loadDocument(tx, row));
  tx.insert(stationVersions)
    .values({
      stationId: row.id,
      version: row.version,
      action: 'station.baseline',
      userId: row.updatedBy,
      changeJson: JSON.stringify(change),
      summaryJson: JSON.stringify(summarizeStationChange(change)),
    })
    .run();
}

/** At start: every station gets its history started (a no-op once it has one). */
export function ensureVersionBaselines(db: Db) {
  db.transaction((tx) => {
    for (const row of tx.select().from(stations).all()) ensureVersionBaseline(tx, row);
  });
}

// ── Writing ─────────────────────────────────────────────────────────────────────────────────────

export interface WriteOutcome<R> {
  action: string;
  target: string | null;
  before: unknown;
  after: unknown;
  summary: string;
  result: R;
  /** re-check the stored model against the document rules before committing (edits) */
  revalidate?: boolean;
  /** what the write changed in the model, kept as the new version */
  change: ModelChange;
}

export interface WriteRequest {
  stationId: number;
  /** the version the editor loaded; undefined only where a caller documents "replace the latest" */
  expectedVersion: number | undefined;
  editor: Editor;
}

function staleStation(db: Tx, row: StationRow, expected: number): HttpError {
  return staleVersion('This station', expected, {
    currentVersion: row.version,
    changedBy: userRef(db, row.updatedBy)?.name ?? null,
    changedAt: row.updatedAt,
  });
}

export function problemsError(message: string, problems: DocumentProblem[]): HttpError {
  const first = problems[0];
  return badRequest(
    `${message}: ${first.path}: ${first.message}${problems.length > 1 ? ` (and ${problems.length - 1} more)` : ''}`,
    problems,
  );
}

/**
 * The one way a station model changes: in one transaction, check the version the editor loaded, run
 * the change, optionally re-check the whole stored model, bump the version and write the audit row.
 * Any throw rolls everything back.
 */
export function writeStation<R>(
  ctx: DbContext,
  req: WriteRequest,
  change: (tx: Tx, row: StationRow) => WriteOutcome<R>,
): ({ version: number } & R) | DryRunAnswer {
  let written;
  try {
    written = writeStationTx(ctx, req, change);
  } catch (err) {
    if (err instanceof DryRunRollback) return err.answer;
    throw err;
  }
  const { outcome, version, name, after } = written;
  if (after) holdModel(ctx.db, req.stationId, version, after);
  recordActivity(ctx.db, {
    userId: req.editor.id,
    kind: `station.${outcome.action}`,
    summary: `${req.editor.name} ${outcome.summary} on ${name}`,
    link: `/stations/${req.stationId}`,
  });
  emitStationChanged({ stationId: req.stationId, version });
  return { version, ...outcome.result };
}

function writeStationTx<R>(
  ctx: DbContext,
  req: WriteRequest,
  change: (tx: Tx, row: StationRow) => WriteOutcome<R>,
) {
  return ctx.db.transaction((tx) => {
    const row = findStationRow(tx, req.stationId);
    if (req.expectedVersion !== undefined && req.expectedVersion !== row.version)
      throw staleStation(tx, row, req.expectedVersion);
    ensureVersionBaseline(tx, row);
    // the model as of the version the write starts from, when the last edit left it in memory
    const held = heldModel(ctx.db, row);
    const outcome = change(tx, row);
    let after: StationDocument | null = null;
    if (outcome.revalidate && held) {
      // it passed the document rules: check what the change brings, and the graph
      const checked = changeProblems(held, outcome.change);
      if (checked.problems.length)
        throw problemsError('The change would break the station model', checked.problems);
      after = checked.doc;
    } else if (outcome.revalidate) {
      const checked = parseStationDocument(loadDocument(tx, findStationRow(tx, req.stationId)));
      if (!checked.ok) throw problemsError('The change would break the station model', checked.problems);
      after = checked.doc;
    } else if (held) after = applyValidChange(held, outcome.change);
    if (ctx.dryRun) {
      const document = after ?? loadDocument(tx, findStationRow(tx, req.stationId));
      throw new DryRunRollback({ dryRun: true, version: row.version, document });
    }
    const version = row.version + 1;
    const bumped = tx
      .update(stations)
      .set({ version, updatedBy: req.editor.id, updatedAt: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))` })
      .where(and(eq(stations.id, row.id), eq(stations.version, row.version)))
      .run();
    if (bumped.changes !== 1) throw staleStation(tx, findStationRow(tx, row.id), row.version);
    tx.insert(stationAudit)
      .values({
        stationId: row.id,
        userId: req.editor.id,
        action: outcome.action,
        target: outcome.target,
        beforeJson: outcome.before === undefined ? null : JSON.stringify(outcome.before),
        afterJson: outcome.after === undefined ? null : JSON.stringify(outcome.after),
        versionAfter: version,
      })
      .run();
    recordStationVersion(tx, {
      snapshotEvery: snapshotEvery(ctx),
      stationId: row.id,
      version,
      action: outcome.action,
      userId: req.editor.id,
      change: outcome.change,
      document: () => loadDocument(tx, findStationRow(tx, row.id)),
    });
    return { outcome, version, name: findStationRow(tx, row.id).name, after };
  });
}

// per database, each station's model as its latest write left it (see heldModel)
const heldModels = new WeakMap<Db, Map<number, { version: number; doc: StationDocument }>>();

/**
 * The station's model as of `row`'s version when the write that made that version left it in
 * memory (no other write came between), else null. Documents are never mutated, so holding one
 * costs only the items later edits replace.
 */
function heldModel(db: Db, row: StationRow): StationDocument | null {
  const held = heldModels.get(db)?.get(row.id);
  return held && held.version === row.version ? held.doc : null;
}

function holdModel(db: Db, stationId: number, version: number, doc: StationDocument) {
  let held = heldModels.get(db);
  if (!held) heldModels.set(db, (held = new Map()));
  held.delete(stationId);
  held.set(stationId, { version, doc });
  while (held.size > HELD_MODELS) held.delete(held.keys().next().value!);
}

/** stations whose latest model is held at the most, least recently written out first */
const HELD_MODELS = 4;

/** What a bulk write changed: the model now against the document it started from. */
export function changeSince(tx: Tx, stationId: number, before: StationDocument): ModelChange {
  return diffStationDocuments(before, loadDocument(tx, findStationRow(tx, stationId)));
}

/** One prepared insert run per row: building a statement per chunk of rows costs several times as much. */
function insertAll<R extends Record<string, unknown>>(tx: Tx, table: SQLiteTable, rows: readonly R[]) {
  if (rows.length === 0) return;
  const slots = Object.fromEntries(Object.keys(rows[0]).map((k) => [k, sql.placeholder(k)]));
  const insert = tx
    .insert(table)
    .values(slots as never)
    .prepare();
  for (const row of rows) insert.run(row);
}

function insertModel(tx: Tx, stationId: number, doc: StationDocument) {
  insertAll(
    tx,
    segments,
    doc.segments.map((s, i) => segmentToRow(stationId, s, i)),
  );
  insertAll(
    tx,
    nodes,
    doc.nodes.map((n, i) => nodeToRow(stationId, n, i)),
  );
  insertAll(
    tx,
    edges,
    doc.edges.map((e, i) => edgeToRow(stationId, e, i)),
  );
  insertAll(
    tx,
    hazards,
    doc.hazards.map((h, i) => hazardToRow(stationId, h, i)),
  );
}

function deleteModel(tx: Tx, stationId: number) {
  for (const table of [edges, nodes, hazards, segments])
    tx.delete(table).where(eq(table.stationId, stationId)).run();
}

export const docCounts = (doc: StationDocument): StationCounts => ({
  nodes: doc.nodes.length,
  edges: doc.edges.length,
  hazards: doc.hazards.length,
  segments: doc.segments.length,
});

/**
 * Parses an uploaded station document's text: JSON first (the parser's message, with line and
 * column), then the document rules, every problem by JSON path.
 */
export function parseStationDocumentText(text: string): StationDocument {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    const raw = (err as Error).message.slice(0, 300);
    const pos = /position (\d+)/.exec(raw);
    let where = '(document)';
    if (pos) {
      const before = text.slice(0, Number(pos[1]));
      const line = before.split('\n').length;
      where = `(document) line ${line}, column ${Number(pos[1]) - before.lastIndexOf('\n')}`;
    }
    throw badRequest(`The file is not valid JSON: ${raw}`, [{ path: where, message: raw }]);
  }
  const parsed = parseStationDocument(json);
  if (!parsed.ok) throw problemsError('The station document is not valid', parsed.problems);
  return parsed.doc;
}

/** Creates a station from a checked document, all in one transaction. */
export function importStation(
  ctx: DbContext,
  doc: StationDocument,
  editor: Editor | null,
): ImportStationResult {
  const id = ctx.db.transaction((tx) => {
    const row = tx
      .insert(stations)
      .values({
        name: doc.name,
        version: 1,
        altitudeKm: doc.orbit.altitudeKm,
        betaDeg: doc.orbit.betaDeg,
        settingsJson: JSON.stringify(doc.settings),
        armsJson: JSON.stringify(doc.arms),
        createdBy: editor?.id ?? null,
        updatedBy: editor?.id ?? null,
      })
      .returning({ id: stations.id })
      .get();
    insertModel(tx, row.id, doc);
    tx.insert(stationAudit)
      .values({
        stationId: row.id,
        userId: editor?.id ?? null,
        action: 'station.import',
        target: doc.name,
        afterJson: JSON.stringify({ name: doc.name, counts: docCounts(doc) }),
        versionAfter: 1,
      })
      .run();
    const created = findStationRow(tx, row.id);
    recordStationVersion(tx, {
      snapshotEvery: snapshotEvery(ctx),
      stationId: row.id,
      version: 1,
      action: 'station.import',
      userId: editor?.id ?? null,
      change: diffStationDocuments(emptyStationDocument(), loadDocument(tx, created)),
      document: () => loadDocument(tx, created),
    });
    return row.id;
  });
  recordActivity(ctx.db, {
    userId: editor?.id ?? null,
    kind: 'station.import',
    summary: `${editor?.name ?? 'Setup'} imported station ${doc.name} (${doc.nodes.length} nodes, ${doc.edges.length} edges)`,
    link: `/stations/${id}`,
  });
  const station = getStation(ctx.db, id);
  return { station, counts: station.counts };
}

/**
 * Replaces a station's whole model (name, orbit, settings, segments, nodes, edges, hazards, arms) with a
 * checked document. Annotations, plans and the audit log stay: they belong to the station, not to
 * one model version. With no `expectedVersion` the latest version is replaced.
 */
export function replaceStationModel(
  ctx: DbContext,
  req: WriteRequest,
  doc: StationDocument,
): ImportStationResult | DryRunAnswer {
  const written = writeStation(ctx, req, (tx, row) => {
    const before = { name: row.name, counts: countsOf(tx, row.id) };
    const beforeDoc = loadDocument(tx, row);
    deleteModel(tx, row.id);
    tx.update(stations)
      .set({
        name: doc.name,
        altitudeKm: doc.orbit.altitudeKm,
        betaDeg: doc.orbit.betaDeg,
        settingsJson: JSON.stringify(doc.settings),
        armsJson: JSON.stringify(doc.arms),
      })
      .where(eq(stations.id, row.id))
      .run();
    insertModel(tx, row.id, doc);
    return {
      action: 'station.replace',
      target: doc.name,
      before,
      after: { name: doc.name, counts: docCounts(doc) },
      summary: `replaced the model (${doc.nodes.length} nodes, ${doc.edges.length} edges)`,
      result: {},
      change: changeSince(tx, row.id, beforeDoc),
    };
  });
  if (isDryRun(written)) return written;
  const station = getStation(ctx.db, req.stationId);
  return { station, counts: station.counts };
}

/**
 * Deletes a station with its model, history, annotations and walkthroughs. A station that plans use
 * is kept (409 naming them): a plan never loses the station it was checked against.
 */
export function deleteStation(ctx: AppContext, req: WriteRequest) {
  const { name, files } = ctx.db.transaction((tx) => {
    const row = findStationRow(tx, req.stationId);
    if (req.expectedVersion !== undefined && req.expectedVersion !== row.version)
      throw staleStation(tx, row, req.expectedVersion);
    const using = tx
      .select({ id: plans.id, title: plans.title, status: plans.status })
      .from(plans)
      .where(eq(plans.stationId, row.id))
      .orderBy(asc(plans.id))
      .all();
    if (using.length) {
      throw conflict(
        `${row.name} cannot be deleted: ${using.length === 1 ? 'a plan uses it' : `${using.length} plans use it`} (${using
          .slice(0, 5)
          .map((p) => `"${p.title}"`)
          .join(
            ', ',
          )}${using.length > 5 ? ', …' : ''}). Delete those plans or move them to another station first.`,
        using.map((p) => ({ path: `plans.${p.id}`, message: `${p.title} (${p.status})` })),
      );
    }
    const files = tx
      .select({ storedName: attachments.storedName })
      .from(attachments)
      .innerJoin(annotations, eq(annotations.id, attachments.annotationId))
      .where(eq(annotations.stationId, row.id))
      .all()
      .map((f) => f.storedName);
    tx.delete(stations).where(eq(stations.id, row.id)).run();
    return { name: row.name, files };
  });
  for (const f of files) removeStoredUpload(ctx.config.dataDir, f);
  recordActivity(ctx.db, {
    userId: req.editor.id,
    kind: 'station.delete',
    summary: `${req.editor.name} deleted the station ${name}`,
  });
}

export function listStationAudit(db: Db, stationId: number, page: number, pageSize: number) {
  findStationRow(db, stationId);
  const total =
    db.select({ n: count() }).from(stationAudit).where(eq(stationAudit.stationId, stationId)).get()?.n ?? 0;
  const rows = db
    .select({ a: stationAudit, userName: users.name })
    .from(stationAudit)
    .leftJoin(users, eq(users.id, stationAudit.userId))
    .where(eq(stationAudit.stationId, stationId))
    .orderBy(desc(stationAudit.id))
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .all();
  const items: StationAuditEntry[] = rows.map(({ a, userName }) => ({
    id: a.id,
    action: a.action,
    target: a.target,
    user: a.userId !== null && userName !== null ? { id: a.userId, name: userName } : null,
    before: a.beforeJson === null ? null : JSON.parse(a.beforeJson),
    after: a.afterJson === null ? null : JSON.parse(a.afterJson),
    versionAfter: a.versionAfter,
    createdAt: a.createdAt,
  }));
  return { items, total, page, pageSize };
}
