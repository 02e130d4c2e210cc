import type { z } from 'zod';
import type { Actor, Permission } from '@shared/auth/permissions';
import { IdParamsSchema } from '@shared/schemas/auth';
import type { ChangeKind } from '@shared/schemas/events';
import type { AppContext } from '../../context';
import { defineRoute } from '../../lib/route';
import { answered, atParam } from './changes';

type Person = Actor & { id: number; name: string };

/**
 * A version-checked record's own routes beside its list, each calling its service as
 * `(ctx, …, person)`: create it at `/`, read, PATCH (the `version` it was loaded at in the body) and
 * DELETE (that version in the query) at `/:id`. The services answer 409 when the version is stale;
 * each write tells the live stream what changed.
 */
export function recordRoutes<C extends z.ZodType, U extends z.ZodType, V>(
  ctx: AppContext,
  kind: ChangeKind,
  access: { read: Permission; write: Permission },
  record: {
    create: [body: C, run: (ctx: AppContext, body: z.infer<C>, person: Person) => unknown];
    get: (id: number) => unknown;
    update: [body: U, run: (ctx: AppContext, id: number, body: z.infer<U>, person: Person) => unknown];
    remove: [
      query: z.ZodType<{ version?: V }>,
      run: (ctx: AppContext, id: number, version: V, person: Person) => void,
    ];
  },
) {
  const [createBody, create] = record.create;
  const [updateBody, update] = record.update;
  const [removeQuery, remove] = record.remove;
  return [
    defineRoute({
      method: 'post',
      path: '/',
      access: access.write,
      status: 201,
      input: { body: createBody },
      handler: (req, _res, { body }) => create(ctx, body as z.infer<C>, req.user!),
      emits: answered(kind),
    }),
    defineRoute({
      method: 'get',
      path: '/:id',
      access: access.read,
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => record.get(params.id),
    }),
    defineRoute({
      method: 'patch',
      path: '/:id',
      access: access.write,
      input: { params: IdParamsSchema, body: updateBody },
      handler: (req, _res, { params, body }) => update(ctx, params.id, body as z.infer<U>, req.user!),
      emits: answered(kind),
    }),
    defineRoute({
      method: 'delete',
      path: '/:id',
      access: access.write,
      input: { params: IdParamsSchema, query: removeQuery },
      handler: (req, _res, { params, query }) => {
        remove(ctx, params.id, (query as { version: V }).version, req.user!);
      },
      emits: atParam(kind, { deleted: true }),
    }),
  ];
}
