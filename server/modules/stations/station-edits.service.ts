import { and, eq, max } from 'drizzle-orm';
import type { z } from 'zod';
import type { AppContext } from '../../context';
import { edges, hazards, nodes, segments, stations } from '../../db/schema';
import { badRequest, conflict, notFound } from '../../lib/http-error';
import { zodDetails } from '../../middleware/validate';
import { edgeId as edgeIdOf, sameValue } from '@shared/compute/station-changes';
import {
  armProblems,
  EdgeSchema,
  HazardSchema,
  NodeSchema,
  OrbitSettingsSchema,
  SegmentSchema,
  StationSettingsSchema,
  type StationEdge,
} from '@shared/schemas/station';
import {
  mergeEdgeChanges,
  mergeHazardChanges,
  mergeNodeChanges,
  mergeOrbit,
  mergeSegmentChanges,
  mergeStationSettings,
  type CreateEdgeInput,
  type CreateHazardInput,
  type CreateNodeInput,
  type CreateSegmentInput,
  type UpdateEdgeInput,
  type UpdateHazardInput,
  type UpdateNodeInput,
  type UpdateSegmentInput,
  type UpdateStationInput,
} from '@shared/schemas/station-edits';
import {
  armsOf,
  edgeFromRow,
  edgeToRow,
  getStation,
  hazardFromRow,
  hazardToRow,
  nodeFromRow,
  nodeToRow,
  segmentFromRow,
  segmentToRow,
  writeStation,
  type Editor,
  type Tx,
} from './stations.service';

/** Parses a merged item with its document schema; problems are reported at the request body's path. */
function checked<S extends z.ZodType>(schema: S, value: unknown, where: string): z.infer<S> {
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const details = zodDetails(parsed.error, where);
    throw badRequest(`The change is not valid: ${details[0].path} ${details[0].message}`, details);
  }
  return parsed.data;
}

type OrdTable = typeof nodes | typeof edges | typeof hazards | typeof segments;
function nextOrd(tx: Tx, table: OrdTable, stationId: number) {
  return (
    (tx
      .select({ m: max(table.ord) })
      .from(table)
      .where(eq(table.stationId, stationId))
      .get()?.m ?? -1) + 1
  );
}

function findNode(tx: Tx, stationId: number, key: string) {
  return tx
    .select()
    .from(nodes)
    .where(and(eq(nodes.stationId, stationId), eq(nodes.key, key)))
    .get();
}

function requireNode(tx: Tx, stationId: number, key: string) {
  const row = findNode(tx, stationId, key);
  if (!row) throw notFound(`Node "${key}"`);
  return row;
}

/** An edge's ends must exist, differ, and not repeat an edge of the same kind between the same pair. */
function checkEdgeEnds(tx: Tx, stationId: number, e: StationEdge, ignoreId?: number) {
  for (const end of ['from', 'to'] as const) {
    if (!findNode(tx, stationId, e[end])) {
      throw badRequest(`Unknown node key "${e[end]}"`, [
        { path: `body.edge.${end}`, message: `unknown node key "${e[end]}"` },
      ]);
    }
  }
  if (e.from === e.to)
    throw badRequest(`An edge cannot join "${e.from}" to itself`, [
      { path: 'body.edge', message: 'self-loop' },
    ]);
  // one way round, then the other: each a search of the index on that end (an OR of the two is a scan)
  const between = (from: string, to: string) =>
    tx
      .select({ id: edges.id })
      .from(edges)
      .where(
        and(
          eq(edges.stationId, stationId),
          eq(edges.fromKey, from),
          eq(edges.toKey, to),
          eq(edges.kind, e.kind),
        ),
      )
      .all();
  const twins = [...between(e.from, e.to), ...between(e.to, e.from)].filter((t) => t.id !== ignoreId);
  if (twins.length)
    throw conflict(
      `There is already a ${e.kind} edge between "${e.from}" and "${e.to}" (edge ${twins[0].id}).`,
    );
}

function requireEdge(tx: Tx, stationId: number, edgeId: number) {
  const row = tx
    .select()
    .from(edges)
    .where(and(eq(edges.stationId, stationId), eq(edges.id, edgeId)))
    .get();
  if (!row) throw notFound(`Edge ${edgeId}`);
  return row;
}

const edgeName = (e: StationEdge) => `${e.from} ↔ ${e.to} (${e.kind})`;

/** An item as the model now stores it (read back, so the kept change is exactly what was stored). */
const storedNode = (tx: Tx, stationId: number, key: string) => nodeFromRow(requireNode(tx, stationId, key));
const storedEdge = (tx: Tx, stationId: number, id: number) => edgeFromRow(requireEdge(tx, stationId, id));
const storedHazard = (tx: Tx, stationId: number, key: string) =>
  hazardFromRow(findHazard(tx, stationId, key)!);
const storedSegment = (tx: Tx, stationId: number, key: string) =>
  segmentFromRow(findSegment(tx, stationId, key)!);

// ── Nodes ───────────────────────────────────────────────────────────────────────────────────────

export function createNode(ctx: AppContext, stationId: number, input: CreateNodeInput, editor: Editor) {
  const node = input.node;
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    if (findNode(tx, stationId, node.key))
      throw conflict(`A node with key "${node.key}" already exists.`, [
        { path: 'body.node.key', message: 'duplicate key' },
      ]);
    tx.insert(nodes)
      .values(nodeToRow(stationId, node, nextOrd(tx, nodes, stationId)))
      .run();
    return {
      action: 'node.create',
      target: node.key,
      before: undefined,
      after: node,
      summary: `added node ${node.key}`,
      result: { node },
      revalidate: true,
      change: { nodes: { added: [storedNode(tx, stationId, node.key)] } },
    };
  });
}

export function updateNode(
  ctx: AppContext,
  stationId: number,
  key: string,
  input: UpdateNodeInput,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    const row = requireNode(tx, stationId, key);
    const before = nodeFromRow(row);
    const node = checked(NodeSchema, mergeNodeChanges(before, input.node), 'body.node');
    tx.update(nodes)
      .set(nodeToRow(stationId, node, row.ord))
      .where(eq(nodes.id, row.id))
      .run();
    return {
      action: 'node.update',
      target: key,
      before,
      after: node,
      summary: `changed node ${key}`,
      result: { node },
      revalidate: true,
      change: { nodes: { changed: [storedNode(tx, stationId, key)] } },
    };
  });
}

/** Deleting a node deletes the edges that touch it; the audit row lists them. */
export function deleteNode(ctx: AppContext, stationId: number, key: string, version: number, editor: Editor) {
  return writeStation(ctx, { stationId, expectedVersion: version, editor }, (tx, station) => {
    const row = requireNode(tx, stationId, key);
    const bases = armsOf(station).filter((a) => a.baseNode === key);
    if (bases.length)
      throw conflict(
        `Node "${key}" is the base of arm${bases.length > 1 ? 's' : ''} ${bases.map((a) => a.key).join(', ')}: move or remove the arm first.`,
      );
    // by each end in turn, each a search of that end's index (an OR of the two is a scan)
    const ends = [edges.fromKey, edges.toKey].map((end) => and(eq(edges.stationId, stationId), eq(end, key)));
    const removedEdges = ends
      .flatMap((at) => tx.select().from(edges).where(at).all())
      .sort((a, b) => a.id - b.id)
      .map(edgeFromRow);
    for (const at of ends) tx.delete(edges).where(at).run();
    tx.delete(nodes).where(eq(nodes.id, row.id)).run();
    const before = { node: nodeFromRow(row), removedEdges };
    return {
      action: 'node.delete',
      target: key,
      before,
      after: undefined,
      summary: `deleted node ${key} and its ${removedEdges.length} edge${removedEdges.length === 1 ? '' : 's'}`,
      result: { removed: before },
      change: {
        nodes: { removed: [key] },
        ...(removedEdges.length ? { edges: { removed: removedEdges.map(edgeIdOf) } } : {}),
      },
    };
  });
}

// ── Edges ───────────────────────────────────────────────────────────────────────────────────────

const graphEdge = (id: number, e: StationEdge) => ({ id, ...e });

export function createEdge(ctx: AppContext, stationId: number, input: CreateEdgeInput, editor: Editor) {
  const edge = input.edge;
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    checkEdgeEnds(tx, stationId, edge);
    const { id } = tx
      .insert(edges)
      .values(edgeToRow(stationId, edge, nextOrd(tx, edges, stationId)))
      .returning({ id: edges.id })
      .get();
    return {
      action: 'edge.create',
      target: edgeName(edge),
      before: undefined,
      after: edge,
      summary: `connected ${edgeName(edge)}`,
      result: { edge: graphEdge(id, edge) },
      revalidate: true,
      change: { edges: { added: [storedEdge(tx, stationId, id)] } },
    };
  });
}

export function updateEdge(
  ctx: AppContext,
  stationId: number,
  id: number,
  input: UpdateEdgeInput,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    const row = requireEdge(tx, stationId, id);
    const before = edgeFromRow(row);
    const edge = checked(EdgeSchema, mergeEdgeChanges(before, input.edge), 'body.edge');
    checkEdgeEnds(tx, stationId, edge, id);
    tx.update(edges)
      .set(edgeToRow(stationId, edge, row.ord))
      .where(eq(edges.id, row.id))
      .run();
    const what =
      before.closed !== edge.closed && Object.keys(input.edge).every((k) => k === 'closed')
        ? edge.closed
          ? 'closed'
          : 'opened'
        : 'changed';
    return {
      action: 'edge.update',
      target: edgeName(edge),
      before,
      after: edge,
      summary: `${what} edge ${edgeName(edge)}`,
      result: { edge: graphEdge(id, edge) },
      revalidate: true,
      change: {
        edges:
          edgeIdOf(before) === edgeIdOf(edge)
            ? { changed: [storedEdge(tx, stationId, id)] }
            : { replaced: [{ id: edgeIdOf(before), item: storedEdge(tx, stationId, id) }] },
      },
    };
  });
}

export function deleteEdge(ctx: AppContext, stationId: number, id: number, version: number, editor: Editor) {
  return writeStation(ctx, { stationId, expectedVersion: version, editor }, (tx) => {
    const before = edgeFromRow(requireEdge(tx, stationId, id));
    tx.delete(edges).where(eq(edges.id, id)).run();
    return {
      action: 'edge.delete',
      target: edgeName(before),
      before,
      after: undefined,
      summary: `disconnected ${edgeName(before)}`,
      result: { removed: graphEdge(id, before) },
      change: { edges: { removed: [edgeIdOf(before)] } },
    };
  });
}

// ── Hazards and segments (keyed items) ──────────────────────────────────────────────────────────

function findHazard(tx: Tx, stationId: number, key: string) {
  return tx
    .select()
    .from(hazards)
    .where(and(eq(hazards.stationId, stationId), eq(hazards.key, key)))
    .get();
}

export function createHazard(ctx: AppContext, stationId: number, input: CreateHazardInput, editor: Editor) {
  const hazard = input.hazard;
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    if (findHazard(tx, stationId, hazard.key))
      throw conflict(`A hazard with key "${hazard.key}" already exists.`, [
        { path: 'body.hazard.key', message: 'duplicate key' },
      ]);
    tx.insert(hazards)
      .values(hazardToRow(stationId, hazard, nextOrd(tx, hazards, stationId)))
      .run();
    return {
      action: 'hazard.create',
      target: hazard.key,
      before: undefined,
      after: hazard,
      summary: `added ${hazard.kind} hazard ${hazard.key}`,
      result: { hazard },
      revalidate: true,
      change: { hazards: { added: [storedHazard(tx, stationId, hazard.key)] } },
    };
  });
}

export function updateHazard(
  ctx: AppContext,
  stationId: number,
  key: string,
  input: UpdateHazardInput,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    const row = findHazard(tx, stationId, key);
    if (!row) throw notFound(`Hazard "${key}"`);
    const before = hazardFromRow(row);
    const hazard = checked(HazardSchema, mergeHazardChanges(before, input.hazard), 'body.hazard');
    tx.update(hazards)
      .set(hazardToRow(stationId, hazard, row.ord))
      .where(eq(hazards.id, row.id))
      .run();
    return {
      action: 'hazard.update',
      target: key,
      before,
      after: hazard,
      summary: `changed hazard ${key}`,
      result: { hazard },
      revalidate: true,
      change: { hazards: { changed: [storedHazard(tx, stationId, key)] } },
    };
  });
}

export function deleteHazard(
  ctx: AppContext,
  stationId: number,
  key: string,
  version: number,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: version, editor }, (tx) => {
    const row = findHazard(tx, stationId, key);
    if (!row) throw notFound(`Hazard "${key}"`);
    tx.delete(hazards).where(eq(hazards.id, row.id)).run();
    const before = hazardFromRow(row);
    return {
      action: 'hazard.delete',
      target: key,
      before,
      after: undefined,
      summary: `deleted hazard ${key}`,
      result: { removed: before },
      change: { hazards: { removed: [key] } },
    };
  });
}

function findSegment(tx: Tx, stationId: number, key: string) {
  return tx
    .select()
    .from(segments)
    .where(and(eq(segments.stationId, stationId), eq(segments.key, key)))
    .get();
}

export function createSegment(ctx: AppContext, stationId: number, input: CreateSegmentInput, editor: Editor) {
  const segment = input.segment;
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    if (findSegment(tx, stationId, segment.key))
      throw conflict(`A segment with key "${segment.key}" already exists.`, [
        { path: 'body.segment.key', message: 'duplicate key' },
      ]);
    tx.insert(segments)
      .values(segmentToRow(stationId, segment, nextOrd(tx, segments, stationId)))
      .run();
    return {
      action: 'segment.create',
      target: segment.key,
      before: undefined,
      after: segment,
      summary: `added segment ${segment.key}`,
      result: { segment },
      revalidate: true,
      change: { segments: { added: [storedSegment(tx, stationId, segment.key)] } },
    };
  });
}

export function updateSegment(
  ctx: AppContext,
  stationId: number,
  key: string,
  input: UpdateSegmentInput,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx) => {
    const row = findSegment(tx, stationId, key);
    if (!row) throw notFound(`Segment "${key}"`);
    const before = segmentFromRow(row);
    const segment = checked(SegmentSchema, mergeSegmentChanges(before, input.segment), 'body.segment');
    tx.update(segments)
      .set(segmentToRow(stationId, segment, row.ord))
      .where(eq(segments.id, row.id))
      .run();
    return {
      action: 'segment.update',
      target: key,
      before,
      after: segment,
      summary: `changed segment ${key}`,
      result: { segment },
      revalidate: true,
      change: { segments: { changed: [storedSegment(tx, stationId, key)] } },
    };
  });
}

export function deleteSegment(
  ctx: AppContext,
  stationId: number,
  key: string,
  version: number,
  editor: Editor,
) {
  return writeStation(ctx, { stationId, expectedVersion: version, editor }, (tx) => {
    const row = findSegment(tx, stationId, key);
    if (!row) throw notFound(`Segment "${key}"`);
    tx.delete(segments).where(eq(segments.id, row.id)).run();
    const before = segmentFromRow(row);
    return {
      action: 'segment.delete',
      target: key,
      before,
      after: undefined,
      summary: `deleted segment ${key}`,
      result: { removed: before },
      change: { segments: { removed: [key] } },
    };
  });
}

// ── Station name, orbit, settings ───────────────────────────────────────────────────────────────

export function updateStation(ctx: AppContext, stationId: number, input: UpdateStationInput, editor: Editor) {
  const written = writeStation(ctx, { stationId, expectedVersion: input.version, editor }, (tx, row) => {
    const beforeOrbit = { altitudeKm: row.altitudeKm, betaDeg: row.betaDeg };
    const beforeSettings = StationSettingsSchema.parse(JSON.parse(row.settingsJson));
    const orbit = checked(OrbitSettingsSchema, mergeOrbit(beforeOrbit, input.orbit), 'body.orbit');
    const settings = checked(
      StationSettingsSchema,
      mergeStationSettings(beforeSettings, input.settings),
      'body.settings',
    );
    const name = input.name ?? row.name;
    const beforeArms = armsOf(row);
    const arms = input.arms ?? beforeArms;
    if (input.arms) {
      const problems = armProblems(input.arms, (k) => findNode(tx, stationId, k) !== undefined, 'body.arms');
      if (problems.length)
        throw badRequest(`The change is not valid: ${problems[0].path} ${problems[0].message}`, problems);
    }
    tx.update(stations)
      .set({
        name,
        altitudeKm: orbit.altitudeKm,
        betaDeg: orbit.betaDeg,
        settingsJson: JSON.stringify(settings),
        armsJson: JSON.stringify(arms),
      })
      .where(eq(stations.id, row.id))
      .run();
    return {
      action: 'station.update',
      target: name,
      before: { name: row.name, orbit: beforeOrbit, settings: beforeSettings, arms: beforeArms },
      after: { name, orbit, settings, arms },
      summary: 'changed the station settings',
      result: {},
      change: {
        ...(name !== row.name ? { name } : {}),
        ...(sameValue(orbit, beforeOrbit) ? {} : { orbit }),
        ...(sameValue(settings, beforeSettings) ? {} : { settings }),
      },
    };
  });
  return { version: written.version, station: getStation(ctx.db, stationId) };
}
