import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema, InviteUserInputSchema, UpdateUserInputSchema } from '@shared/schemas/auth';
import { inviteUser, listUsers, resendInvitation, updateUser } from './users.service';

export function usersRouter(ctx: AppContext) {
  return mountRoutes('/api/users', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'users:manage',
      handler: () => listUsers(ctx.db),
    }),
    defineRoute({
      method: 'post',
      path: '/invite',
      access: 'users:manage',
      status: 201,
      input: { body: InviteUserInputSchema },
      handler: async (req, _res, { body }) => ({ user: await inviteUser(ctx, body, req.user!) }),
    }),
    defineRoute({
      method: 'patch',
      path: '/:id',
      access: 'users:manage',
      input: { params: IdParamsSchema, body: UpdateUserInputSchema },
      handler: (req, _res, { params, body }) => ({ user: updateUser(ctx.db, params.id, body, req.user!) }),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/resend-invite',
      access: 'users:manage',
      input: { params: IdParamsSchema },
      handler: async (req, _res, { params }) => {
        await resendInvitation(ctx, params.id, req.user!);
      },
    }),
  ]);
}
