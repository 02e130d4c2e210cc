import { and, asc, count, desc, eq, gt, inArray, max } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { edges, nodes, segments, stations } from '../../db/schema';
import { HttpError, badRequest } from '../../lib/http-error';
import { JsonText } from '../../lib/route';
import { reachCheck } from '@shared/compute/reach';
import { planSockets, type SocketCandidate } from '@shared/compute/socket-planner';
import { GridTooLargeError, gridCandidates, type FaceCandidate } from '@shared/compute/truss-faces';
import { orbitSummary } from '@shared/compute/orbit';
import {
  MAX_MATRIX_NODES,
  type RouteMatrix,
  type RouteMatrixRequest,
  type RouteRequest,
  type RouteResult,
} from '@shared/schemas/route';
import { matrixNodesFor } from '@shared/compute/route-matrix';
import {
  MAX_SOCKET_CANDIDATES,
  type AcceptedSocket,
  type AcceptSocketPlanInput,
  type AcceptSocketPlanResult,
  type ReachRequest,
  type ReachResult,
  type SocketPlanRequest,
  type SocketPlanResult,
} from '@shared/schemas/sockets';
import {
  StationSettingsSchema,
  type StationDocument,
  type StationEdge,
  type StationNode,
  type Vec3,
} from '@shared/schemas/station';
import {
  changeSince,
  isDryRun,
  edgeToRow,
  findStationRow,
  loadDocument,
  nodeToRow,
  segmentFromRow,
  writeStation,
  type DryRunAnswer,
  type Editor,
  type Tx,
} from '../stations/stations.service';
import { socketNameFor } from '@shared/compute/socket-names';
import { clipGraphHeld, routeRequestProblems } from '@shared/compute/routes';
import { routeMatrixOn, routeOffPath, warmClipGraph } from './clip-builder';
import { getCompiledStation, type CompiledEntry } from './compiled-cache';
import type { OrbitQuery } from './compute.schemas';

const unknownNode = (key: string, what = 'node') =>
  new HttpError('NOT_FOUND', `The station has no ${what} "${key}".`);

/** A socket by key: 404 when the station has no such node, 400 when the node is not a socket. */
export function socketNode(doc: StationDocument, key: string, path: string): StationNode & { normal: Vec3 } {
  const node = doc.nodes.find((n) => n.key === key);
  if (!node) throw unknownNode(key);
  if (node.kind !== 'socket' || !node.normal) {
    throw badRequest(`"${key}" is a ${node.kind}, not a foot-restraint socket.`, [
      { path, message: 'not a socket' },
    ]);
  }
  return node as StationNode & { normal: Vec3 };
}

/**
 * The checks of a route request against the station, before any search: an unknown node key
 * anywhere in it (ends, start anchor, extra attach points) is a 404 naming the key and its path,
 * like an unknown end always was; a start anchor that is not an attach point, or a paid-out
 * length not below the tether, is a 400 at its path. `at` is where the request sits in the body.
 */
function checkRouteRequest(entry: CompiledEntry, request: RouteRequest, at: string) {
  const kindOf = (key: string) =>
    entry.attachKeys.has(key) ? 'attach' : entry.nodeKeys.has(key) ? 'node' : undefined;
  const problems = routeRequestProblems(request, entry.doc.settings.tetherLengthM, kindOf);
  if (!problems.length) return;
  const unknown = problems.filter((p) => p.kind === 'unknown-key');
  const shown = unknown.length ? unknown : problems;
  const details = shown.map((p) => ({ path: `${at}.${p.path}`, message: p.message }));
  if (unknown.length) {
    const key = requestKeyAt(request, unknown[0].path);
    throw new HttpError('NOT_FOUND', `The station has no node "${key}".`, details);
  }
  throw badRequest(`The request is not valid: ${details[0].path} ${details[0].message}`, details);
}

/** The node key at a request path (`from`, `startAnchor`, `extraAttach.3`). */
function requestKeyAt(request: RouteRequest, path: string): string {
  const [field, index] = path.split('.');
  if (field === 'extraAttach') return request.extraAttach![Number(index)];
  return request[field as 'from' | 'to' | 'startAnchor']!;
}

/**
 * A route on the main thread (plans, walkthroughs, and the routes endpoint without a pool); `at`
 * is where the request sits in the body, for the paths of its errors.
 */
export function routeOn(entry: CompiledEntry, request: RouteRequest, at = 'body'): RouteResult {
  checkRouteRequest(entry, request, at);
  return routeOffPath(entry.compiled, entry.doc, request);
}

/**
 * Whether a query is answered on the main thread although there is a pool: on a station of at
 * most `routeInlineNodes` nodes whose index the main thread already holds, a fastest route (a
 * few tenths of a millisecond at 10k nodes), or an exact one whose clip graph this thread holds.
 * The hop to a worker and back costs more than that. Anything else goes to the pool, and a station
 * small enough whose index is not held yet is compiled here once the answer is on its way.
 */
function answersInline(ctx: AppContext, entry: CompiledEntry, request: RouteRequest): boolean {
  if (entry.doc.nodes.length > ctx.config.routeInlineNodes) return false;
  if (!entry.isCompiled) {
    setImmediate(() => void entry.compiled);
    return false;
  }
  return request.mode === 'fastest' || clipGraphHeld(entry.compiled, entry.doc.settings, request);
}

/**
 * `POST /api/stations/:id/routes`: small queries on the main thread (see answersInline), the rest
 * on the worker pool when there is one (the answer comes back as JSON text, sent as it is).
 */
export function computeRoute(
  ctx: AppContext,
  stationId: number,
  request: RouteRequest,
): RouteResult | Promise<JsonText> {
  const entry = getCompiledStation(ctx, stationId);
  if (!ctx.routePool || answersInline(ctx, entry, request)) return routeOn(entry, request);
  checkRouteRequest(entry, request, 'body');
  const station = `${ctx.config.databaseUrl}#${stationId}`;
  return ctx.routePool
    .route({ station, version: entry.version, doc: entry.doc, request })
    .then((json) => new JsonText(json));
}

/**
 * At start, the clip graph of the most recently changed station too large to build one during a
 * query, built in the background on the thread that will answer its routes and days (a builder
 * thread builds one at a time; other large stations are built on their first query, as after any
 * change). Without it the first plan's day on that station runs on the label search. The id of the
 * station whose build started, or null.
 */
export async function warmLargeStations(ctx: AppContext): Promise<number | null> {
  const large = ctx.db
    .select({ id: nodes.stationId })
    .from(nodes)
    .innerJoin(stations, eq(stations.id, nodes.stationId))
    .groupBy(nodes.stationId)
    .having(gt(count(), ctx.config.routeClipInlineNodes))
    .orderBy(desc(stations.updatedAt), desc(stations.id))
    .all();
  for (const { id } of large) {
    const entry = getCompiledStation(ctx, id);
    const started = ctx.routePool
      ? await ctx.routePool.warm({
          station: `${ctx.config.databaseUrl}#${id}`,
          version: entry.version,
          doc: entry.doc,
        })
      : warmClipGraph(entry.compiled, entry.doc);
    if (started) return id;
  }
  return null;
}

/**
 * `POST /api/stations/:id/route-matrix`: every node known (else 404 naming it and its path), the
 * matrix within the work a station of this size allows (else 400 naming the most nodes it takes),
 * computed on the worker pool when there is one.
 */
export function computeRouteMatrix(
  ctx: AppContext,
  stationId: number,
  request: RouteMatrixRequest,
): RouteMatrix | Promise<JsonText> {
  const entry = getCompiledStation(ctx, stationId);
  const unknown = request.nodes.flatMap((key, i) => (entry.nodeKeys.has(key) ? [] : [{ key, i }]));
  if (unknown.length) {
    throw new HttpError(
      'NOT_FOUND',
      `The station has no node "${unknown[0].key}".`,
      unknown.map(({ key, i }) => ({ path: `body.nodes[${i}]`, message: `no node "${key}"` })),
    );
  }
  const most = matrixNodesFor(entry.doc.nodes.length, MAX_MATRIX_NODES);
  if (request.nodes.length > most) {
    const message = `at most ${most} nodes on a station of ${entry.doc.nodes.length} nodes`;
    throw badRequest(`The matrix is too large: ${message}.`, [{ path: 'body.nodes', message }]);
  }
  if (!ctx.routePool) return routeMatrixOn(entry, request);
  const station = `${ctx.config.databaseUrl}#${stationId}`;
  return ctx.routePool
    .matrix({ station, version: entry.version, doc: entry.doc, matrix: request })
    .then((json) => new JsonText(json));
}

export function reachOn(doc: StationDocument, request: ReachRequest): ReachResult {
  const socket = socketNode(doc, request.socket, 'body.socket');
  const { reach } = doc.settings;
  const check = reachCheck({
    socketPosition: socket.position,
    socketNormal: socket.normal,
    target: request.target,
    standOffM: reach.standOffM,
    radiusM: reach.radiusM,
    yawStepDeg: reach.yawStepDeg,
    pitchStepDeg: reach.pitchStepDeg,
  });
  const len = Math.hypot(...socket.normal);
  const workPoint = socket.position.map((p, i) => p + (socket.normal[i] / len) * reach.standOffM) as Vec3;
  return { ...check, socket: socket.key, workPoint, standOffM: reach.standOffM, radiusM: reach.radiusM };
}

export function computeReach(ctx: AppContext, stationId: number, request: ReachRequest): ReachResult {
  return reachOn(getCompiledStation(ctx, stationId).doc, request);
}

/** Candidate keys are looked up in the database this many at a time. */
const KEY_CHUNK = 500;

/**
 * The listed candidate sockets, in list order, or every socket of the station: one indexed lookup
 * per chunk of keys, never a scan per key. Unknown key → 404, a node that is not a socket → 400.
 */
function candidateSockets(tx: Tx, stationId: number, keys: readonly string[] | undefined): SocketCandidate[] {
  const toCandidate = (r: typeof nodes.$inferSelect): SocketCandidate => ({
    key: r.key,
    position: [r.x, r.y, r.z],
    normal: [r.nx!, r.ny!, r.nz!],
  });
  if (!keys) {
    const isSocket = and(eq(nodes.stationId, stationId), eq(nodes.kind, 'socket'));
    const total = tx.select({ n: count() }).from(nodes).where(isSocket).get()?.n ?? 0;
    if (total > MAX_SOCKET_CANDIDATES)
      throw badRequest(
        `The station has ${total} sockets, more than the ${MAX_SOCKET_CANDIDATES} one plan can weigh: list the candidates to try.`,
        [{ path: 'body.candidates', message: `list at most ${MAX_SOCKET_CANDIDATES} candidates` }],
      );
    return tx
      .select()
      .from(nodes)
      .where(isSocket)
      .orderBy(asc(nodes.ord), asc(nodes.id))
      .all()
      .map(toCandidate);
  }
  const byKey = new Map<string, typeof nodes.$inferSelect>();
  const distinct = [...new Set(keys)];
  for (let i = 0; i < distinct.length; i += KEY_CHUNK) {
    const chunk = distinct.slice(i, i + KEY_CHUNK);
    for (const r of tx
      .select()
      .from(nodes)
      .where(and(eq(nodes.stationId, stationId), inArray(nodes.key, chunk)))
      .all())
      byKey.set(r.key, r);
  }
  return keys.map((key, i) => {
    const r = byKey.get(key);
    if (!r) throw unknownNode(key);
    if (r.kind !== 'socket' || r.nx === null || r.ny === null || r.nz === null)
      throw badRequest(`"${key}" is a ${r.kind}, not a foot-restraint socket.`, [
        { path: `body.candidates.${i}`, message: 'not a socket' },
      ]);
    return toCandidate(r);
  });
}

/** The finest grid spacing that keeps about `allowed` points where `spacingM` gives `points` (points ∝ 1/spacing²). */
const spacingFor = (spacingM: number, points: number, allowed: number) =>
  Math.ceil(spacingM * Math.sqrt(points / Math.max(allowed, 1)) * 20) / 20;

/**
 * A socket plan for one station, reading only what it needs (settings, segments, candidate
 * sockets) in one transaction. At most MAX_SOCKET_CANDIDATES candidates, grid points included:
 * the grid is counted from the faces' extents before any point is made, and a grid too fine for
 * the faces near the targets is a 400 that names a spacing that fits.
 */
export function socketPlanOn(db: Db, stationId: number, request: SocketPlanRequest): SocketPlanResult {
  const {
    reach,
    segments: stationSegments,
    listed,
  } = db.transaction((tx) => {
    const row = findStationRow(tx, stationId);
    return {
      reach: StationSettingsSchema.parse(JSON.parse(row.settingsJson)).reach,
      segments:
        request.gridSpacingM === undefined
          ? []
          : tx
              .select()
              .from(segments)
              .where(eq(segments.stationId, stationId))
              .orderBy(asc(segments.ord), asc(segments.id))
              .all()
              .map(segmentFromRow),
      listed: candidateSockets(tx, stationId, request.candidates),
    };
  });
  const candidates = listed;
  if (request.gridSpacingM !== undefined) {
    const allowed = MAX_SOCKET_CANDIDATES - listed.length;
    let grid: FaceCandidate[];
    try {
      // only faces a target could be reached from: keeps the candidate count to what matters
      grid = gridCandidates(stationSegments, request.gridSpacingM, {
        near: request.targets,
        withinM: reach.standOffM + reach.radiusM,
        maxPoints: allowed,
      });
    } catch (err) {
      if (!(err instanceof GridTooLargeError)) throw err;
      const at = spacingFor(request.gridSpacingM, err.points, allowed);
      throw badRequest(
        `A ${request.gridSpacingM} m grid over the faces within reach of these targets has ${err.points} points; ` +
          `with ${listed.length} listed sockets at most ${allowed} fit. Use a spacing of at least ${at} m, or fewer targets.`,
        [{ path: 'body.gridSpacingM', message: `too fine here: at least ${at} m` }],
      );
    }
    for (const { position, normal } of grid) candidates.push({ position, normal });
  }
  const {
    chosen: _chosen,
    usefulCandidateCount: _useful,
    searchNodes: _nodes,
    ...plan
  } = planSockets({
    targets: request.targets,
    candidates,
    standOffM: reach.standOffM,
    radiusM: reach.radiusM,
    yawStepDeg: reach.yawStepDeg,
    pitchStepDeg: reach.pitchStepDeg,
  });
  return plan;
}

/** Nodes a new socket may be joined to: the junctions and anchors of a handrail (never a worksite). */
const HANDRAIL_JOIN_KINDS = new Set(['junction', 'anchor']);

/** What an accept of planned sockets writes (or, on a dry run, would write). */
export type AcceptSocketsAnswer = AcceptSocketPlanResult | (DryRunAnswer & { sockets: AcceptedSocket[] });

/**
 * Saves planned sockets as socket nodes named after their bay (`PB3-S05`, labelled with the bay and
 * face), each joined by a hop edge to the nearest junction or anchor on a handrail, through the
 * stations module's one write path: one transaction, version checked and bumped, audited. On a dry
 * run (`ctx.dryRun`) nothing is written and the answer lists the sockets it would add.
 */
export function acceptSocketPlan(
  ctx: AppContext,
  stationId: number,
  input: AcceptSocketPlanInput,
  editor: Editor,
): AcceptSocketsAnswer {
  let sockets: AcceptedSocket[] = [];
  const written = writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    const doc = loadDocument(tx, findStationRow(tx, stationId));
    const onHandrail = new Set(doc.edges.filter((e) => e.kind === 'handrail').flatMap((e) => [e.from, e.to]));
    const joinable = doc.nodes.filter((n) => HANDRAIL_JOIN_KINDS.has(n.kind) && onHandrail.has(n.key));
    if (joinable.length === 0)
      throw badRequest('The station has no handrail junction or anchor to join a new socket to.');
    const taken = new Set(doc.nodes.map((n) => n.key));
    const details: { path: string; message: string }[] = [];
    input.sockets.forEach((s, i) => {
      if (s.key && taken.has(s.key))
        details.push({ path: `body.sockets.${i}.key`, message: `the key "${s.key}" is already used` });
      if (s.key) taken.add(s.key);
    });
    if (details.length)
      throw badRequest(`The request is not valid: ${details[0].path} ${details[0].message}`, details);
    const added = input.sockets.map((s) => {
      const len = Math.hypot(...s.normal);
      const normal = s.normal.map((v) => v / len) as Vec3;
      const named = s.key
        ? { key: s.key, label: s.label || socketNameFor({ ...s, normal }, doc.segments, new Set()).label }
        : socketNameFor({ ...s, normal }, doc.segments, taken);
      let nearest = joinable[0];
      let best = Infinity;
      for (const n of joinable) {
        const d = Math.hypot(
          n.position[0] - s.position[0],
          n.position[1] - s.position[1],
          n.position[2] - s.position[2],
        );
        if (d < best) [nearest, best] = [n, d];
      }
      const node: StationNode = {
        key: named.key,
        kind: 'socket',
        label: s.label || named.label,
        position: s.position,
        normal,
        ...(s.notes ? { notes: s.notes } : {}),
      };
      const edge: StationEdge = { from: nearest.key, to: named.key, kind: 'hop' };
      return { node, edge, hopM: best };
    });
    const ord = (table: typeof nodes | typeof edges) =>
      (tx
        .select({ m: max(table.ord) })
        .from(table)
        .where(eq(table.stationId, stationId))
        .get()?.m ?? -1) + 1;
    const nodeOrd = ord(nodes);
    const edgeOrd = ord(edges);
    added.forEach((a, i) => {
      tx.insert(nodes)
        .values(nodeToRow(stationId, a.node, nodeOrd + i))
        .run();
      tx.insert(edges)
        .values(edgeToRow(stationId, a.edge, edgeOrd + i))
        .run();
    });
    const keys = added.map((a) => a.node.key);
    sockets = added.map((a) => ({ ...a.node, joinedTo: a.edge.from, hopM: a.hopM }));
    return {
      action: 'sockets.accept',
      target: keys.join(', '),
      before: undefined,
      after: { nodes: added.map((a) => a.node), edges: added.map((a) => a.edge) },
      summary: `added ${keys.length} planned foot-restraint socket${keys.length === 1 ? '' : 's'} (${keys.join(', ')})`,
      result: { sockets },
      revalidate: true,
      change: changeSince(tx, stationId, doc),
    };
  });
  return isDryRun(written) ? { ...written, sockets } : written;
}

export function orbitFor(query: OrbitQuery) {
  const { periodSeconds, eclipseSeconds, sunlitSeconds, criticalBetaDeg, eclipseFraction } =
    orbitSummary(query);
  return { periodSeconds, eclipseSeconds, sunlitSeconds, criticalBetaDeg, eclipseFraction, ...query };
}
