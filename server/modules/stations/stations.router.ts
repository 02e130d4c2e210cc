import type { Request } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { defineRoute, mountRoutes, sendCachedJson } from '../../lib/route';
import { MB, diskUpload, uploadedFile } from '../../lib/uploads';
import { runTask } from '../compute/tasks';
import { toGraphColumns } from '@shared/compute/graph-columns';
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
  isDryRun,
  listStations,
  type DryRunAnswer,
  type Editor,
} from './stations.service';
import { noticeStationWrite, previewAffectedPlans } from '../plans/plan-station.service';
import { answered, atParam } from '../events/changes';

/** A station document of several hundred thousand nodes is well under this. */
export const STATION_FILE_MAX_BYTES = 20 * MB;
export const CSV_FILE_MAX_BYTES = 10 * MB;

const GraphQuerySchema = z.object({ version: VersionTextSchema.optional() });
const StationVersionParamsSchema = StationIdParamsSchema.extend({ version: VersionTextSchema });

/** A new station's import form: `name` in place of the document's (a form field). */
const ImportFormSchema = z.object({
  name: z.string().trim().min(1, 'a station needs a name').max(200).optional(),
});

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

/** `?dryRun=1` on a station write: answer the reviewed plans it would touch, and write nothing. */
export const DryRunQuerySchema = z.object({
  dryRun: z
    .enum(['0', '1', 'false', 'true'])
    .optional()
    .transform((v) => v === '1' || v === 'true'),
});
type DryRunQuery = z.infer<typeof DryRunQuerySchema>;
/** The app as a write sees it: with `dryRun`, the write rolls back and answers the model it would make. */
export const withDryRun = (ctx: AppContext, dryRun: boolean): AppContext =>
  dryRun ? ({ ...ctx, dryRun } as AppContext) : ctx;
const DeleteQuerySchema = VersionQuerySchema.extend(DryRunQuerySchema.shape);
const MultipartQuerySchema = MultipartVersionSchema.extend(DryRunQuerySchema.shape);

/**
 * A station write that touches plans in review or approved answers them (`affectedPlans`); those
 * get the change listed on them and their authors a mail. A dry run always answers the list (maybe
 * empty) and writes nothing.
 */
export async function withAffectedPlans(ctx: AppContext, req: Request, stationId: number, written: unknown) {
  const r = (await written) as DryRunAnswer | { version?: number; station?: { version: number } };
  if (isDryRun(r)) {
    // what else the write says it would do (the sockets an accept adds) stays; the model does not
    const { document, ...rest } = r;
    return { ...rest, affectedPlans: previewAffectedPlans(ctx, stationId, r.version, document) };
  }
  const version = r.version ?? r.station!.version;
  const affectedPlans = await noticeStationWrite(ctx, stationId, version, editor(req));
  // named only when there are some: a write that touches no reviewed plan answers as it always has
  return affectedPlans.length ? { ...r, affectedPlans } : r;
}

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
  ctx: AppContext,
  ops: {
    create(c: AppContext, stationId: number, body: z.infer<C>, ed: Editor): unknown;
    update(c: AppContext, stationId: number, params: z.infer<P>, body: z.infer<U>, ed: Editor): unknown;
    remove(c: AppContext, stationId: number, params: z.infer<P>, version: number, ed: Editor): unknown;
  },
) {
  const on = (q: DryRunQuery) => withDryRun(ctx, q.dryRun);
  return [
    defineRoute({
      method: 'post',
      path: `/:id/${collection}`,
      access: 'stations:edit',
      status: 201,
      input: { params: StationIdParamsSchema, query: DryRunQuerySchema, body: createBody },
      handler: (req, _res, input) =>
        withAffectedPlans(
          ctx,
          req,
          input.params.id,
          ops.create(on(input.query), input.params.id, input.body as z.infer<C>, editor(req)),
        ),
    }),
    defineRoute({
      method: 'patch',
      path: `/:id/${collection}/${item}`,
      access: 'stations:edit',
      input: { params, query: DryRunQuerySchema, body: updateBody },
      handler: (req, _res, input) => {
        const p = input.params as z.infer<P>;
        return withAffectedPlans(
          ctx,
          req,
          p.id,
          ops.update(on(input.query), p.id, p, input.body as z.infer<U>, editor(req)),
        );
      },
    }),
    defineRoute({
      method: 'delete',
      path: `/:id/${collection}/${item}`,
      access: 'stations:edit',
      input: { params, query: DeleteQuerySchema },
      handler: (req, _res, input) => {
        const p = input.params as z.infer<P>;
        return withAffectedPlans(
          ctx,
          req,
          p.id,
          ops.remove(on(input.query), p.id, p, input.query.version, editor(req)),
        );
      },
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
      input: { query: DryRunQuerySchema, body: ImportFormSchema },
      handler: async (req, res, { query, body }) => {
        const answer = await runTask(ctx, 'station-import', {
          file: stationDocumentFile(req),
          editor: editor(req),
          ...(body.name ? { name: body.name } : {}),
          dryRun: query.dryRun,
        });
        if (!query.dryRun) return answer;
        // a dry run wrote nothing: 200 with the document's name, counts and the stations named so
        res.status(200).json(answer);
      },
      // nothing to tell after a dry run (its answer went out above; the handler returned nothing)
      emits: (_input, r) => answered('station')(_input, (r as { station?: unknown } | undefined)?.station),
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
      input: { params: StationIdParamsSchema, query: DryRunQuerySchema, body: UpdateStationInputSchema },
      handler: (req, _res, { params, query, body }) =>
        withAffectedPlans(
          ctx,
          req,
          params.id,
          edits.updateStation(withDryRun(ctx, query.dryRun), params.id, body, editor(req)),
        ),
    }),
    defineRoute({
      method: 'put',
      path: '/:id/import',
      access: 'stations:import',
      before: [documentUpload],
      input: { params: StationIdParamsSchema, query: MultipartQuerySchema, body: MultipartVersionSchema },
      handler: (req, _res, { params, query, body }) =>
        withAffectedPlans(
          ctx,
          req,
          params.id,
          runTask(ctx, 'station-replace', {
            file: stationDocumentFile(req),
            request: {
              stationId: params.id,
              expectedVersion: body.version ?? query.version,
              editor: editor(req),
            },
            dryRun: query.dryRun,
          }),
        ),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/import-csv',
      access: 'stations:import',
      before: [csvUpload],
      input: { params: StationIdParamsSchema, query: MultipartQuerySchema, body: MultipartVersionSchema },
      handler: (req, _res, { params, query, body }) =>
        withAffectedPlans(
          ctx,
          req,
          params.id,
          runTask(ctx, 'station-csv', {
            nodes: storedFile(req, 'nodes'),
            edges: storedFile(req, 'edges'),
            arms: storedFile(req, 'arms'),
            request: {
              stationId: params.id,
              expectedVersion: body.version ?? query.version,
              editor: editor(req),
            },
            dryRun: query.dryRun,
          }),
        ),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/graph',
      access: 'read',
      input: { params: StationIdParamsSchema, query: GraphQuerySchema },
      handler: (req, res, { params, query }) => {
        const live = getStationGraphJson(ctx.db, params.id);
        if (query.version === undefined || query.version === live.version)
          return sendCachedJson(req, res, live);
        else return stationGraphAt(ctx.db, params.id, query.version);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/graph/columns',
      access: 'read',
      input: { params: StationIdParamsSchema, query: GraphQuerySchema },
      handler: (req, res, { params, query }) => {
        const live = getStationGraphJson(ctx.db, params.id, 'columns');
        if (query.version === undefined || query.version === live.version)
          return sendCachedJson(req, res, live);
        else return toGraphColumns(stationGraphAt(ctx.db, params.id, query.version));
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
      emits: atParam('station', { deleted: true }),
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

    ...itemRoutes(
      'nodes',
      ':key',
      StationKeyParamsSchema,
      CreateNodeInputSchema,
      UpdateNodeInputSchema,
      ctx,
      {
        create: (c, id, body, ed) => edits.createNode(c, id, body, ed),
        update: (c, id, p, body, ed) => edits.updateNode(c, id, p.key, body, ed),
        remove: (c, id, p, version, ed) => edits.deleteNode(c, id, p.key, version, ed),
      },
    ),
    ...itemRoutes(
      'edges',
      ':edgeId',
      StationEdgeParamsSchema,
      CreateEdgeInputSchema,
      UpdateEdgeInputSchema,
      ctx,
      {
        create: (c, id, body, ed) => edits.createEdge(c, id, body, ed),
        update: (c, id, p, body, ed) => edits.updateEdge(c, id, p.edgeId, body, ed),
        remove: (c, id, p, version, ed) => edits.deleteEdge(c, id, p.edgeId, version, ed),
      },
    ),
    ...itemRoutes(
      'hazards',
      ':key',
      StationKeyParamsSchema,
      CreateHazardInputSchema,
      UpdateHazardInputSchema,
      ctx,
      {
        create: (c, id, body, ed) => edits.createHazard(c, id, body, ed),
        update: (c, id, p, body, ed) => edits.updateHazard(c, id, p.key, body, ed),
        remove: (c, id, p, version, ed) => edits.deleteHazard(c, id, p.key, version, ed),
      },
    ),
    ...itemRoutes(
      'segments',
      ':key',
      StationKeyParamsSchema,
      CreateSegmentInputSchema,
      UpdateSegmentInputSchema,
      ctx,
      {
        create: (c, id, body, ed) => edits.createSegment(c, id, body, ed),
        update: (c, id, p, body, ed) => edits.updateSegment(c, id, p.key, body, ed),
        remove: (c, id, p, version, ed) => edits.deleteSegment(c, id, p.key, version, ed),
      },
    ),
  ]);
}
