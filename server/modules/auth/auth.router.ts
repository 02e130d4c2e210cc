import type { Request } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { HttpError } from '../../lib/http-error';
import { defineRoute, mountRoutes } from '../../lib/route';
import { clearSession, endSession, issueSession } from '../../middleware/session';
import { SetPasswordInputSchema, SignInInputSchema } from '@shared/schemas/auth';
import {
  endAllSessions,
  getInvitation,
  setPasswordWithToken,
  toPublicUser,
  verifyCredentials,
} from './auth.service';

/** The e-mail a sign-in names, as the limiters count it (the body is not validated yet). */
function signInEmail(req: Request): string {
  const email: unknown = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? email.trim().toLowerCase().slice(0, 320) : '';
}

export function authRouter(ctx: AppContext) {
  // failed attempts only: a team signing in all morning from one office is not throttled
  const failedSignIns = (limit: number, key: (req: Request) => string, message: string) =>
    rateLimit({
      windowMs: ctx.config.signInWindowMs,
      limit,
      skipSuccessfulRequests: true,
      keyGenerator: key,
      // X-Forwarded-For counts only from the proxies TRUST_PROXY names; any client may send one
      validate: { xForwardedForHeader: false },
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, _res, next) => next(new HttpError('RATE_LIMITED', message)),
    });
  // per address and e-mail: one person mistyping (or one guesser) locks only that account from
  // that address, never the team behind the same address; per e-mail, from anywhere: a guesser
  // spread over many addresses is stopped too
  const perAddressAndEmail = failedSignIns(
    ctx.config.signInAttempts,
    (req) => `${ipKeyGenerator(req.ip ?? '')}\u0000${signInEmail(req)}`,
    'Too many failed sign-in attempts for this account. Wait a few minutes and try again.',
  );
  const perEmail = failedSignIns(
    ctx.config.signInAccountAttempts,
    signInEmail,
    'Too many failed sign-in attempts for this account. Wait a few minutes and try again, or ask your team lead to set a new password.',
  );

  return mountRoutes('/api/auth', [
    defineRoute({
      method: 'post',
      path: '/sign-in',
      access: 'public',
      before: [perAddressAndEmail, perEmail],
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
      handler: (req, res) => {
        endSession(ctx, req, res);
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
