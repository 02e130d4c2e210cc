import { and, asc, count, desc, eq, gt, isNotNull, lte } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { stationVersions, users } from '../../db/schema';
import { notFound } from '../../lib/http-error';
import {
  applyStationChange,
  emptyStationDocument,
  type StationChange,
} from '@shared/compute/station-changes';
import type { StationDocument } from '@shared/schemas/station';
import type { StationGraph, StationVersionDetail, StationVersionEntry } from '@shared/schemas/station-edits';
import { findStationRow, firstKeptVersion, graphOf, userRef, type Tx } from './stations.service';

type VersionRow = typeof stationVersions.$inferSelect;

function versionRow(db: Tx, stationId: number, version: number): VersionRow {
  const row = db
    .select()
    .from(stationVersions)
    .where(and(eq(stationVersions.stationId, stationId), eq(stationVersions.version, version)))
    .get();
  if (!row) {
    const first = firstKeptVersion(db, stationId);
    throw notFound(
      first === null || version > first
        ? `Version ${version} of this station`
        : `Version ${version} of this station (its history is kept from version ${first})`,
    );
  }
  return row;
}

export function listStationVersions(db: Db, stationId: number, page: number, pageSize: number) {
  const station = findStationRow(db, stationId);
  const where = eq(stationVersions.stationId, stationId);
  const total = db.select({ n: count() }).from(stationVersions).where(where).get()?.n ?? 0;
  const items: StationVersionEntry[] = db
    .select({
      version: stationVersions.version,
      action: stationVersions.action,
      userId: stationVersions.userId,
      userName: users.name,
      summaryJson: stationVersions.summaryJson,
      createdAt: stationVersions.createdAt,
    })
    .from(stationVersions)
    .leftJoin(users, eq(users.id, stationVersions.userId))
    .where(where)
    .orderBy(desc(stationVersions.version))
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .all()
    .map((r) => ({
      version: r.version,
      action: r.action,
      user: r.userId !== null && r.userName !== null ? { id: r.userId, name: r.userName } : null,
      summary: JSON.parse(r.summaryJson) as string[],
      createdAt: r.createdAt,
    }));
  return {
    stationId,
    currentVersion: station.version,
    firstKeptVersion: firstKeptVersion(db, stationId),
    items,
    total,
    page,
    pageSize,
  };
}

/** One version: what its write changed, in full. */
export function getStationVersion(db: Db, stationId: number, version: number): StationVersionDetail {
  findStationRow(db, stationId);
  const row = versionRow(db, stationId, version);
  const user = userRef(db, row.userId);
  return {
    version: row.version,
    action: row.action,
    user,
    summary: JSON.parse(row.summaryJson) as string[],
    createdAt: row.createdAt,
    change: JSON.parse(row.changeJson) as StationChange,
  };
}

/** Rebuilt documents, a few per database: a pinned version is read over and over. */
const rebuilt = new WeakMap<Db, Map<string, StationDocument>>();
const REBUILT_KEEP = 8;

/**
 * The station document at a kept version: the last snapshot at or before it (or the empty station
 * before the first kept version) with the changes after it applied in order.
 */
export function stationDocumentAt(db: Db, stationId: number, version: number): StationDocument {
  let cache = rebuilt.get(db);
  if (!cache) rebuilt.set(db, (cache = new Map()));
  const key = `${stationId}@${version}`;
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const doc = db.transaction((tx) => {
    findStationRow(tx, stationId);
    versionRow(tx, stationId, version);
    const base = tx
      .select()
      .from(stationVersions)
      .where(
        and(
          eq(stationVersions.stationId, stationId),
          lte(stationVersions.version, version),
          isNotNull(stationVersions.snapshotJson),
        ),
      )
      .orderBy(desc(stationVersions.version))
      .get();
    let document = base ? (JSON.parse(base.snapshotJson!) as StationDocument) : emptyStationDocument();
    const rows = tx
      .select({ changeJson: stationVersions.changeJson })
      .from(stationVersions)
      .where(
        and(
          eq(stationVersions.stationId, stationId),
          lte(stationVersions.version, version),
          base ? gt(stationVersions.version, base.version) : undefined,
        ),
      )
      .orderBy(asc(stationVersions.version))
      .all();
    for (const r of rows) document = applyStationChange(document, JSON.parse(r.changeJson) as StationChange);
    return document;
  });
  cache.set(key, doc);
  while (cache.size > REBUILT_KEEP) cache.delete(cache.keys().next().value!);
  return doc;
}

/**
 * The graph view of a kept version. The current version is the live graph; an earlier one is
 * rebuilt, with edge ids standing for the edge's place in that version's list (its own ids were
 * those of rows since replaced) and the station's name, orbit and settings as they were.
 */
export function stationGraphAt(db: Db, stationId: number, version: number): StationGraph {
  const doc = stationDocumentAt(db, stationId, version);
  return db.transaction((tx) => {
    const row = versionRow(tx, stationId, version);
    const station = findStationRow(tx, stationId);
    const user = userRef(tx, row.userId);
    return graphOf(
      {
        ...station,
        version,
        name: doc.name,
        altitudeKm: doc.orbit.altitudeKm,
        betaDeg: doc.orbit.betaDeg,
        settingsJson: JSON.stringify(doc.settings),
        updatedAt: row.createdAt,
      },
      doc,
      user,
    );
  });
}
