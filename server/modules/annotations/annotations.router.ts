import type { Request } from 'express';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { defineRoute, mountRoutes } from '../../lib/route';
import { MB, contentDisposition, memoryUpload, requireImage, uploadedFile } from '../../lib/uploads';
import { IdParamsSchema } from '@shared/schemas/auth';
import {
  AnnotationListQuerySchema,
  CreateAnnotationInputSchema,
  CreateReplyInputSchema,
  UpdateAnnotationInputSchema,
} from '@shared/schemas/annotations';
import { StationIdParamsSchema } from '@shared/schemas/station-edits';
import {
  addAttachment,
  addReply,
  createAnnotation,
  getAnnotation,
  listAnnotations,
  openAttachment,
  updateAnnotation,
} from './annotations.service';
import { answered, atParam } from '../events/changes';

export const ATTACHMENT_MAX_BYTES = 5 * MB;

export function annotationsRouter(ctx: AppContext) {
  const imageUpload = memoryUpload(ATTACHMENT_MAX_BYTES, [{ name: 'file' }]);
  const author = (req: Request) => ({ id: req.user!.id, name: req.user!.name, role: req.user!.role });

  return mountRoutes('/api', [
    defineRoute({
      method: 'get',
      path: '/stations/:id/annotations',
      access: 'read',
      input: { params: StationIdParamsSchema, query: AnnotationListQuerySchema },
      handler: (_req, _res, { params, query }) => listAnnotations(ctx.db, params.id, query.status),
    }),
    defineRoute({
      method: 'post',
      path: '/stations/:id/annotations',
      access: 'annotations:write',
      status: 201,
      input: { params: StationIdParamsSchema, body: CreateAnnotationInputSchema },
      handler: (req, _res, { params, body }) => createAnnotation(ctx, params.id, body, author(req)),
      emits: answered('annotation'),
    }),
    defineRoute({
      method: 'get',
      path: '/annotations/:id',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => getAnnotation(ctx.db, params.id),
    }),
    defineRoute({
      method: 'patch',
      path: '/annotations/:id',
      access: 'annotations:write',
      input: { params: IdParamsSchema, body: UpdateAnnotationInputSchema },
      handler: (req, _res, { params, body }) => updateAnnotation(ctx, params.id, body, author(req)),
      emits: answered('annotation'),
    }),
    defineRoute({
      method: 'post',
      path: '/annotations/:id/replies',
      access: 'annotations:write',
      status: 201,
      input: { params: IdParamsSchema, body: CreateReplyInputSchema },
      handler: (req, _res, { params, body }) => addReply(ctx, params.id, body, author(req)),
      emits: atParam('annotation'),
    }),
    defineRoute({
      method: 'post',
      path: '/annotations/:id/attachments',
      access: 'annotations:write',
      status: 201,
      before: [imageUpload],
      input: { params: IdParamsSchema },
      handler: async (req, _res, { params }) => {
        const file = uploadedFile(req, 'file');
        if (!file)
          throw badRequest('Attach the image as the multipart field "file".', [
            { path: 'file', message: 'required' },
          ]);
        const type = await requireImage(file.buffer);
        return {
          attachment: addAttachment(
            ctx,
            params.id,
            { buffer: file.buffer, originalName: file.originalname, type },
            author(req),
          ),
        };
      },
      emits: atParam('annotation'),
    }),
    defineRoute({
      method: 'get',
      path: '/attachments/:id',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, res, { params }) =>
        new Promise<void>((resolve, reject) => {
          const file = openAttachment(ctx, params.id);
          res.setHeader('X-Content-Type-Options', 'nosniff');
          res.setHeader('Content-Type', file.mimeType);
          res.setHeader('Content-Disposition', contentDisposition('inline', file.fileName));
          res.sendFile(file.path, { headers: { 'Content-Type': file.mimeType } }, (err) =>
            err ? reject(err) : resolve(),
          );
        }),
    }),
  ]);
}
