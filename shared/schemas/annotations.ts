import { z } from 'zod';
import { KeySchema, Vec3Schema, type Vec3 } from './station';

export const ANNOTATION_STATUSES = ['open', 'resolved'] as const;
export const AnnotationStatusSchema = z.enum(ANNOTATION_STATUSES);
export type AnnotationStatus = z.infer<typeof AnnotationStatusSchema>;

const title = z.string().trim().min(1, 'enter a title').max(200);
const body = z.string().trim().max(10000);

/** Pinned to a node (taking its position) or to a free point: exactly one of the two. */
export const CreateAnnotationInputSchema = z
  .strictObject({
    nodeKey: KeySchema.optional(),
    position: Vec3Schema.optional(),
    title,
    body: body.default(''),
  })
  .refine((a) => (a.nodeKey === undefined) !== (a.position === undefined), {
    message: 'pin the note to a node (nodeKey) or to a point (position), not both',
    path: ['nodeKey'],
  });
export type CreateAnnotationInput = z.infer<typeof CreateAnnotationInputSchema>;

export const CreateReplyInputSchema = z.strictObject({ body: body.min(1, 'write a reply') });
export type CreateReplyInput = z.infer<typeof CreateReplyInputSchema>;

export const UpdateAnnotationInputSchema = z
  .strictObject({ status: AnnotationStatusSchema.optional(), title: title.optional(), body: body.optional() })
  .refine((a) => Object.values(a).some((v) => v !== undefined), { message: 'nothing to change' });
export type UpdateAnnotationInput = z.infer<typeof UpdateAnnotationInputSchema>;

export const AnnotationListQuerySchema = z.object({ status: AnnotationStatusSchema.optional() });

export interface PersonRef {
  id: number;
  name: string;
}

export interface AnnotationReply {
  id: number;
  body: string;
  author: PersonRef | null;
  createdAt: string;
}

export interface AnnotationAttachment {
  id: number;
  fileName: string;
  mimeType: string;
  sizeBytes: number;
  /** where a signed-in user downloads it */
  url: string;
  uploadedBy: PersonRef | null;
  createdAt: string;
}

export interface Annotation {
  id: number;
  stationId: number;
  nodeKey: string | null;
  position: Vec3;
  title: string;
  body: string;
  status: AnnotationStatus;
  author: PersonRef | null;
  resolvedBy: PersonRef | null;
  createdAt: string;
  updatedAt: string;
  replies: AnnotationReply[];
  attachments: AnnotationAttachment[];
}
