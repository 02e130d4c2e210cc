import type { Request } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { defineRoute, mountRoutes } from '../../lib/route';
import { MB, memoryUpload, readTextUpload } from '../../lib/uploads';
import {
  AuditQuerySchema,
  CreateEdgeInputSchema,
  CreateHazardInputSchema,
  CreateNodeInputSchema,
  CreateSegmentInputSchema,
  StationEdgeParamsSchema,
  StationIdParamsSchema,
  StationKeyParamsSchema,
  UpdateEdgeInputSchema,
  UpdateHazardInputSchema,
  UpdateNodeInputSchema,
  UpdateSegmentInputSchema,
  UpdateStationInputSchema,
  VersionQuerySchema,
} from '@shared/schemas/station-edits';
import { VersionTextSchema } from '@shared/schemas/version';
import { importStationCsv } from './station-csv.service';
import * as edits from './station-edits.service';
import {
  exportStationDocument,
  getStation,
  getStationGraphJson,
  importStation,
  listStationAudit,
  listStations,
  parseStationDocumentText,
  replaceStationModel,
  type Editor,
} from './stations.service';

/** A station document of several hundred thousand nodes is well under this. */
export const STATION_FILE_MAX_BYTES = 20 * MB;
export const CSV_FILE_MAX_BYTES = 10 * MB;

/** The `version` of a multipart form: a form field or `?version=` (a field wins). */
const MultipartVersionSchema = z.object({ version: VersionTextSchema.optional() });

function uploadedFile(req: Request, field: string): Express.Multer.File | undefined {
  if (req.file?.fieldname === field) return req.file;
  const files = req.files as Record<string, Express.Multer.File[]> | undefined;
  return files?.[field]?.[0];
}

async function stationDocumentFrom(req: Request) {
  const file = uploadedFile(req, 'file');
  if (!file)
    throw badRequest('Attach the station document as the multipart field "file".', [
      { path: 'file', message: 'required' },
    ]);
  return parseStationDocumentText(await readTextUpload(file.buffer, 'station document'));
}

const editor = (req: Request): Editor => ({ id: req.user!.id, name: req.user!.name });

/** POST a new item, PATCH one (version in the body), DELETE one (`?version=`): the edit routes of one collection. */
function itemRoutes<
  P extends z.ZodObject<{ id: z.ZodType<number> }>,
  C extends z.ZodType,
  U extends z.ZodType,
>(
  collection: string,
  item: string,
  params: P,
  createBody: C,
  updateBody: U,
  ops: {
    create(stationId: number, body: z.infer<C>, ed: Editor): unknown;
    update(stationId: number, params: z.infer<P>, body: z.infer<U>, ed: Editor): unknown;
    remove(stationId: number, params: z.infer<P>, version: number, ed: Editor): unknown;
  },
) {
  return [
    defineRoute({
      method: 'post',
      path: `/:id/${collection}`,
      access: 'stations:edit',
      status: 201,
      input: { params: StationIdParamsSchema, body: createBody },
      handler: (req, _res, input) => ops.create(input.params.id, input.body as z.infer<C>, editor(req)),
    }),
    defineRoute({
      method: 'patch',
      path: `/:id/${collection}/${item}`,
      access: 'stations:edit',
      input: { params, body: updateBody },
      handler: (req, _res, input) =>
        ops.update(
          (input.params as z.infer<P>).id,
          input.params as z.infer<P>,
          input.body as z.infer<U>,
          editor(req),
        ),
    }),
    defineRoute({
      method: 'delete',
      path: `/:id/${collection}/${item}`,
      access: 'stations:edit',
      input: { params, query: VersionQuerySchema },
      handler: (req, _res, input) =>
        ops.remove(
          (input.params as z.infer<P>).id,
          input.params as z.infer<P>,
          input.query.version,
          editor(req),
        ),
    }),
  ];
}

export function stationsRouter(ctx: AppContext) {
  const documentUpload = memoryUpload(STATION_FILE_MAX_BYTES, 1).single('file');
  const csvUpload = memoryUpload(CSV_FILE_MAX_BYTES, 2).fields([
    { name: 'nodes', maxCount: 1 },
    { name: 'edges', maxCount: 1 },
  ]);
  const idParams = { params: StationIdParamsSchema };

  return mountRoutes('/api/stations', [
    defineRoute({ method: 'get', path: '/', access: 'read', handler: () => listStations(ctx.db) }),
    defineRoute({
      method: 'post',
      path: '/import',
      access: 'stations:import',
      status: 201,
      before: [documentUpload],
      handler: async (req) => importStation(ctx, await stationDocumentFrom(req), editor(req)),
    }),
    defineRoute({
      method: 'get',
      path: '/:id',
      access: 'read',
      input: idParams,
      handler: (_req, _res, { params }) => getStation(ctx.db, params.id),
    }),
    defineRoute({
      method: 'patch',
      path: '/:id',
      access: 'stations:edit',
      input: { params: StationIdParamsSchema, body: UpdateStationInputSchema },
      handler: (req, _res, { params, body }) => edits.updateStation(ctx, params.id, body, editor(req)),
    }),
    defineRoute({
      method: 'put',
      path: '/:id/import',
      access: 'stations:import',
      before: [documentUpload],
      input: { params: StationIdParamsSchema, query: MultipartVersionSchema, body: MultipartVersionSchema },
      handler: async (req, _res, { params, query, body }) => {
        const doc = await stationDocumentFrom(req);
        return replaceStationModel(
          ctx,
          { stationId: params.id, expectedVersion: body.version ?? query.version, editor: editor(req) },
          doc,
        );
      },
    }),
    defineRoute({
      method: 'post',
      path: '/:id/import-csv',
      access: 'stations:import',
      before: [csvUpload],
      input: { params: StationIdParamsSchema, query: MultipartVersionSchema, body: MultipartVersionSchema },
      handler: async (req, _res, { params, query, body }) => {
        const read = async (field: 'nodes' | 'edges') => {
          const f = uploadedFile(req, field);
          return f
            ? { name: f.originalname || `${field}.csv`, text: await readTextUpload(f.buffer, `${field} CSV`) }
            : undefined;
        };
        const files = { nodes: await read('nodes'), edges: await read('edges') };
        return importStationCsv(
          ctx,
          { stationId: params.id, expectedVersion: body.version ?? query.version, editor: editor(req) },
          files,
        );
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/graph',
      access: 'read',
      input: idParams,
      handler: (_req, res, { params }) => {
        res.type('application/json').send(getStationGraphJson(ctx.db, params.id).json);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/export',
      access: 'read',
      input: idParams,
      handler: (_req, res, { params }) => {
        const { fileName, document } = exportStationDocument(ctx.db, params.id);
        res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
        return document;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/audit',
      access: 'read',
      input: { params: StationIdParamsSchema, query: AuditQuerySchema },
      handler: (_req, _res, { params, query }) =>
        listStationAudit(ctx.db, params.id, query.page, query.pageSize),
    }),

    ...itemRoutes('nodes', ':key', StationKeyParamsSchema, CreateNodeInputSchema, UpdateNodeInputSchema, {
      create: (id, body, ed) => edits.createNode(ctx, id, body, ed),
      update: (id, p, body, ed) => edits.updateNode(ctx, id, p.key, body, ed),
      remove: (id, p, version, ed) => edits.deleteNode(ctx, id, p.key, version, ed),
    }),
    ...itemRoutes('edges', ':edgeId', StationEdgeParamsSchema, CreateEdgeInputSchema, UpdateEdgeInputSchema, {
      create: (id, body, ed) => edits.createEdge(ctx, id, body, ed),
      update: (id, p, body, ed) => edits.updateEdge(ctx, id, p.edgeId, body, ed),
      remove: (id, p, version, ed) => edits.deleteEdge(ctx, id, p.edgeId, version, ed),
    }),
    ...itemRoutes(
      'hazards',
      ':key',
      StationKeyParamsSchema,
      CreateHazardInputSchema,
      UpdateHazardInputSchema,
      {
        create: (id, body, ed) => edits.createHazard(ctx, id, body, ed),
        update: (id, p, body, ed) => edits.updateHazard(ctx, id, p.key, body, ed),
        remove: (id, p, version, ed) => edits.deleteHazard(ctx, id, p.key, version, ed),
      },
    ),
    ...itemRoutes(
      'segments',
      ':key',
      StationKeyParamsSchema,
      CreateSegmentInputSchema,
      UpdateSegmentInputSchema,
      {
        create: (id, body, ed) => edits.createSegment(ctx, id, body, ed),
        update: (id, p, body, ed) => edits.updateSegment(ctx, id, p.key, body, ed),
        remove: (id, p, version, ed) => edits.deleteSegment(ctx, id, p.key, version, ed),
      },
    ),
  ]);
}
