import fs from 'node:fs';
import { and, asc, desc, eq, inArray, isNotNull } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { annotationReplies, annotations, attachments, nodes, users } from '../../db/schema';
import { badRequest, forbidden, notFound } from '../../lib/http-error';
import {
  removeStoredUpload,
  sanitizeFileName,
  storeUpload,
  storedUploadPath,
  type DetectedType,
} from '../../lib/uploads';
import type { Role } from '@shared/auth/permissions';
import type {
  Annotation,
  AnnotationStatus,
  CreateAnnotationInput,
  CreateReplyInput,
  PersonRef,
  UpdateAnnotationInput,
} from '@shared/schemas/annotations';
import type { NodeNote } from '@shared/compute/station-notes';
import { recordActivity } from '../activity/activity.service';
import { findStationRow } from '../stations/stations.service';

export interface Author {
  id: number;
  name: string;
  role: Role;
}

type AnnotationRow = typeof annotations.$inferSelect;

function peopleById(db: Db, ids: (number | null)[]): Map<number, PersonRef> {
  const wanted = [...new Set(ids.filter((id): id is number => id !== null))];
  if (!wanted.length) return new Map();
  return new Map(
    db
      .select({ id: users.id, name: users.name })
      .from(users)
      .where(inArray(users.id, wanted))
      .all()
      .map((u) => [u.id, u]),
  );
}

function toAnnotations(db: Db, rows: AnnotationRow[]): Annotation[] {
  if (!rows.length) return [];
  const ids = rows.map((r) => r.id);
  const replies = db
    .select()
    .from(annotationReplies)
    .where(inArray(annotationReplies.annotationId, ids))
    .orderBy(asc(annotationReplies.id))
    .all();
  const files = db
    .select()
    .from(attachments)
    .where(inArray(attachments.annotationId, ids))
    .orderBy(asc(attachments.id))
    .all();
  const people = peopleById(db, [
    ...rows.flatMap((r) => [r.authorId, r.resolvedBy]),
    ...replies.map((r) => r.authorId),
    ...files.map((f) => f.uploadedBy),
  ]);
  const person = (id: number | null) => (id === null ? null : (people.get(id) ?? null));
  return rows.map((r) => ({
    id: r.id,
    stationId: r.stationId,
    nodeKey: r.nodeKey,
    position: [r.x, r.y, r.z],
    title: r.title,
    body: r.body,
    status: r.status,
    author: person(r.authorId),
    resolvedBy: r.status === 'resolved' ? person(r.resolvedBy) : null,
    createdAt: r.createdAt,
    updatedAt: r.updatedAt,
    replies: replies
      .filter((p) => p.annotationId === r.id)
      .map((p) => ({ id: p.id, body: p.body, author: person(p.authorId), createdAt: p.createdAt })),
    attachments: files
      .filter((f) => f.annotationId === r.id)
      .map((f) => ({
        id: f.id,
        fileName: f.originalName,
        mimeType: f.mimeType,
        sizeBytes: f.sizeBytes,
        url: `/api/attachments/${f.id}`,
        uploadedBy: person(f.uploadedBy),
        createdAt: f.createdAt,
      })),
  }));
}

function findAnnotationRow(db: Db, id: number): AnnotationRow {
  const row = db.select().from(annotations).where(eq(annotations.id, id)).get();
  if (!row) throw notFound('Annotation');
  return row;
}

export function getAnnotation(db: Db, id: number): Annotation {
  return toAnnotations(db, [findAnnotationRow(db, id)])[0];
}

export function listAnnotations(db: Db, stationId: number, status?: AnnotationStatus): Annotation[] {
  findStationRow(db, stationId);
  const where = status
    ? and(eq(annotations.stationId, stationId), eq(annotations.status, status))
    : eq(annotations.stationId, stationId);
  return toAnnotations(db, db.select().from(annotations).where(where).orderBy(desc(annotations.id)).all());
}

/** The most notes a plan's day or a walkthrough is matched against: the newest open ones. */
export const MAX_DAY_NOTES = 500;
const NOTE_BODY_CHARS = 280;

/**
 * The station's open notes pinned to a node, newest first, for a plan's day and a walkthrough to
 * show where the work passes (a long text cut to its start: the station screen has the whole note).
 */
export function openNodeNotes(db: Db, stationId: number): NodeNote[] {
  return db
    .select({
      id: annotations.id,
      nodeKey: annotations.nodeKey,
      title: annotations.title,
      body: annotations.body,
    })
    .from(annotations)
    .where(
      and(
        eq(annotations.stationId, stationId),
        eq(annotations.status, 'open'),
        isNotNull(annotations.nodeKey),
      ),
    )
    .orderBy(desc(annotations.id))
    .limit(MAX_DAY_NOTES)
    .all()
    .map((r) => ({
      id: r.id,
      nodeKey: r.nodeKey!,
      title: r.title,
      body: r.body.length > NOTE_BODY_CHARS ? `${r.body.slice(0, NOTE_BODY_CHARS - 1)}…` : r.body,
    }));
}

const annotationLink = (r: { stationId: number; id: number }) =>
  `/stations/${r.stationId}?annotation=${r.id}`;

export function createAnnotation(
  ctx: AppContext,
  stationId: number,
  input: CreateAnnotationInput,
  author: Author,
): Annotation {
  const station = findStationRow(ctx.db, stationId);
  let position = input.position;
  if (input.nodeKey !== undefined) {
    const node = ctx.db
      .select()
      .from(nodes)
      .where(and(eq(nodes.stationId, stationId), eq(nodes.key, input.nodeKey)))
      .get();
    if (!node)
      throw badRequest(`Unknown node key "${input.nodeKey}"`, [
        { path: 'body.nodeKey', message: `no node "${input.nodeKey}" in ${station.name}` },
      ]);
    position = [node.x, node.y, node.z];
  }
  const [x, y, z] = position!;
  const row = ctx.db
    .insert(annotations)
    .values({
      stationId,
      nodeKey: input.nodeKey ?? null,
      x,
      y,
      z,
      title: input.title,
      body: input.body,
      authorId: author.id,
    })
    .returning()
    .get();
  recordActivity(ctx.db, {
    userId: author.id,
    kind: 'annotation.create',
    summary: `${author.name} pinned a note "${row.title}" on ${station.name}`,
    link: annotationLink(row),
  });
  return getAnnotation(ctx.db, row.id);
}

export function addReply(
  ctx: AppContext,
  annotationId: number,
  input: CreateReplyInput,
  author: Author,
): Annotation {
  const row = findAnnotationRow(ctx.db, annotationId);
  ctx.db.insert(annotationReplies).values({ annotationId, body: input.body, authorId: author.id }).run();
  recordActivity(ctx.db, {
    userId: author.id,
    kind: 'annotation.reply',
    summary: `${author.name} replied to "${row.title}"`,
    link: annotationLink(row),
  });
  return getAnnotation(ctx.db, annotationId);
}

/** Anyone who may write annotations may resolve or reopen one; only its author or an admin may reword it. */
export function updateAnnotation(
  ctx: AppContext,
  annotationId: number,
  input: UpdateAnnotationInput,
  editor: Author,
): Annotation {
  const row = findAnnotationRow(ctx.db, annotationId);
  const rewording =
    (input.title !== undefined && input.title !== row.title) ||
    (input.body !== undefined && input.body !== row.body);
  if (rewording && row.authorId !== editor.id && editor.role !== 'admin')
    throw forbidden('Only the author of a note (or an admin) can change its title or text.');
  const statusChange = input.status !== undefined && input.status !== row.status;
  ctx.db
    .update(annotations)
    .set({
      ...(input.title !== undefined ? { title: input.title } : {}),
      ...(input.body !== undefined ? { body: input.body } : {}),
      ...(statusChange
        ? { status: input.status, resolvedBy: input.status === 'resolved' ? editor.id : null }
        : {}),
      updatedAt: new Date().toISOString(),
    })
    .where(eq(annotations.id, annotationId))
    .run();
  if (statusChange) {
    const verb = input.status === 'resolved' ? 'resolved' : 'reopened';
    recordActivity(ctx.db, {
      userId: editor.id,
      kind: `annotation.${verb}`,
      summary: `${editor.name} ${verb} "${row.title}"`,
      link: annotationLink(row),
    });
  }
  return getAnnotation(ctx.db, annotationId);
}

export const MAX_ATTACHMENTS_PER_ANNOTATION = 20;

/** Stores a checked image under a random name; the row and the file come or go together. */
export function addAttachment(
  ctx: AppContext,
  annotationId: number,
  file: { buffer: Buffer; originalName: string; type: DetectedType },
  uploader: Author,
) {
  findAnnotationRow(ctx.db, annotationId);
  const existing = ctx.db
    .select({ id: attachments.id })
    .from(attachments)
    .where(eq(attachments.annotationId, annotationId))
    .all();
  if (existing.length >= MAX_ATTACHMENTS_PER_ANNOTATION)
    throw badRequest(`A note can carry at most ${MAX_ATTACHMENTS_PER_ANNOTATION} images.`);
  const storedName = storeUpload(ctx.config.dataDir, file.buffer, file.type.ext);
  try {
    const stem = sanitizeFileName(file.originalName, 'image').replace(/\.[A-Za-z0-9]{1,5}$/, '');
    const row = ctx.db
      .insert(attachments)
      .values({
        annotationId,
        storedName,
        originalName: `${stem || 'image'}.${file.type.ext}`,
        mimeType: file.type.mime,
        sizeBytes: file.buffer.length,
        uploadedBy: uploader.id,
      })
      .returning()
      .get();
    return getAnnotation(ctx.db, annotationId).attachments.find((a) => a.id === row.id)!;
  } catch (err) {
    removeStoredUpload(ctx.config.dataDir, storedName);
    throw err;
  }
}

export function openAttachment(ctx: AppContext, id: number) {
  const row = ctx.db.select().from(attachments).where(eq(attachments.id, id)).get();
  if (!row) throw notFound('Attachment');
  const file = storedUploadPath(ctx.config.dataDir, row.storedName);
  if (!fs.existsSync(file)) throw notFound('Attachment file');
  return { path: file, fileName: row.originalName, mimeType: row.mimeType, sizeBytes: row.sizeBytes };
}
