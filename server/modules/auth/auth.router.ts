import { rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { HttpError } from '../../lib/http-error';
import { defineRoute, mountRoutes } from '../../lib/route';
import { clearSession, issueSession } from '../../middleware/session';
import { SetPasswordInputSchema, SignInInputSchema } from '@shared/schemas/auth';
import {
  endAllSessions,
  getInvitation,
  setPasswordWithToken,
  toPublicUser,
  verifyCredentials,
} from './auth.service';

export function authRouter(ctx: AppContext) {
  // failed attempts only: a team signing in all morning from one office is not throttled
  const signInLimiter = rateLimit({
    windowMs: ctx.config.signInWindowMs,
    limit: ctx.config.signInAttempts,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) =>
      next(
        new HttpError('RATE_LIMITED', 'Too many failed sign-in attempts. Wait a few minutes and try again.'),
      ),
  });

  return mountRoutes('/api/auth', [
    defineRoute({
      method: 'post',
      path: '/sign-in',
      access: 'public',
      before: [signInLimiter],
      input: { body: SignInInputSchema },
      handler: async (_req, res, { body }) => {
        const user = await verifyCredentials(ctx.db, body.email, body.password);
        issueSession(ctx, res, user);
        return { user: toPublicUser(user) };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/sign-out',
      access: 'public',
      handler: (_req, res) => {
        clearSession(ctx, res);
        return undefined;
      },
    }),
    defineRoute({
      method: 'post',
      path: '/sign-out-everywhere',
      access: 'read',
      handler: (req, res) => {
        endAllSessions(ctx.db, req.user!.id);
        clearSession(ctx, res);
        return undefined;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/me',
      access: 'read',
      handler: (req) => ({ user: toPublicUser(req.user!) }),
    }),
    defineRoute({
      method: 'get',
      path: '/invitations/:token',
      access: 'public',
      input: { params: z.object({ token: z.string().min(16).max(200) }) },
      handler: (_req, _res, { params }) => getInvitation(ctx.db, params.token),
    }),
    defineRoute({
      method: 'post',
      path: '/set-password',
      access: 'public',
      input: { body: SetPasswordInputSchema },
      handler: async (_req, res, { body }) => {
        const user = await setPasswordWithToken(ctx.db, body.token, body.password);
        issueSession(ctx, res, user);
        return { user: toPublicUser(user) };
      },
    }),
  ]);
}
