import type { Request } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { defineRoute, mountRoutes } from '../../lib/route';
import { MB, diskUpload, uploadedFile } from '../../lib/uploads';
import { runTask } from '../compute/tasks';
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
import type { UploadedFile } from './station-import.service';
import * as edits from './station-edits.service';
import { getStationVersion, listStationVersions, stationGraphAt } from './station-versions.service';
import {
  deleteStation,
  exportStationDocument,
  getStation,
  getStationGraphJson,
  listStationAudit,
  listStations,
  type Editor,
} from './stations.service';

/** A station document of several hundred thousand nodes is well under this. */
export const STATION_FILE_MAX_BYTES = 20 * MB;
export const CSV_FILE_MAX_BYTES = 10 * MB;

const GraphQuerySchema = z.object({ version: VersionTextSchema.optional() });
const StationVersionParamsSchema = StationIdParamsSchema.extend({ version: VersionTextSchema });

/** The `version` of a multipart form: a form field or `?version=` (a field wins). */
const MultipartVersionSchema = z.object({ version: VersionTextSchema.optional() });

function storedFile(req: Request, field: string): UploadedFile | undefined {
  const file = uploadedFile(req, field);
  return file && { name: file.originalname || `${field}.csv`, path: file.path };
}

function stationDocumentFile(req: Request): UploadedFile {
  const file = storedFile(req, 'file');
  if (!file)
    throw badRequest('Attach the station document as the multipart field "file".', [
      { path: 'file', message: 'required' },
    ]);
  return file;
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
  const documentUpload = diskUpload(STATION_FILE_MAX_BYTES, [{ name: 'file' }]);
  const csvUpload = diskUpload(CSV_FILE_MAX_BYTES, [{ name: 'nodes' }, { name: 'edges' }, { name: 'arms' }]);
  const idParams = { params: StationIdParamsSchema };

  return mountRoutes('/api/stations', [
    defineRoute({ method: 'get', path: '/', access: 'read', handler: () => listStations(ctx.db) }),
    defineRoute({
      method: 'post',
      path: '/import',
      access: 'stations:import',
      status: 201,
      before: [documentUpload],
      handler: (req) =>
        runTask(ctx, 'station-import', { file: stationDocumentFile(req), editor: editor(req) }),
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
      handler: (req, _res, { params, query, body }) =>
        runTask(ctx, 'station-replace', {
          file: stationDocumentFile(req),
          request: {
            stationId: params.id,
            expectedVersion: body.version ?? query.version,
            editor: editor(req),
          },
        }),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/import-csv',
      access: 'stations:import',
      before: [csvUpload],
      input: { params: StationIdParamsSchema, query: MultipartVersionSchema, body: MultipartVersionSchema },
      handler: (req, _res, { params, query, body }) =>
        runTask(ctx, 'station-csv', {
          nodes: storedFile(req, 'nodes'),
          edges: storedFile(req, 'edges'),
          arms: storedFile(req, 'arms'),
          request: {
            stationId: params.id,
            expectedVersion: body.version ?? query.version,
            editor: editor(req),
          },
        }),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/graph',
      access: 'read',
      input: { params: StationIdParamsSchema, query: GraphQuerySchema },
      handler: (_req, res, { params, query }) => {
        const live = getStationGraphJson(ctx.db, params.id);
        if (query.version === undefined || query.version === live.version)
          res.type('application/json').send(live.json);
        else return stationGraphAt(ctx.db, params.id, query.version);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/versions',
      access: 'read',
      input: { params: StationIdParamsSchema, query: AuditQuerySchema },
      handler: (_req, _res, { params, query }) =>
        listStationVersions(ctx.db, params.id, query.page, query.pageSize),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/versions/:version',
      access: 'read',
      input: { params: StationVersionParamsSchema },
      handler: (_req, _res, { params }) => getStationVersion(ctx.db, params.id, params.version),
    }),
    defineRoute({
      method: 'delete',
      path: '/:id',
      access: 'stations:import',
      input: { params: StationIdParamsSchema, query: VersionQuerySchema },
      handler: (req, _res, { params, query }) => {
        deleteStation(ctx, { stationId: params.id, expectedVersion: query.version, editor: editor(req) });
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
