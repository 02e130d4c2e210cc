import crypto from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import jwt from 'jsonwebtoken';
import type { AppContext } from '../context';
import { findSessionUser, isSessionRevoked, revokeSession } from '../modules/auth/auth.service';
import { heldSessionUser, holdSessionUser } from '../modules/auth/session-cache';

export const SESSION_COOKIE = 'tw_session';

interface SessionClaims {
  sub: string;
  tv: number;
  /** seconds since the epoch */
  exp: number;
}

export function issueSession(ctx: AppContext, res: Response, user: { id: number; tokenVersion: number }) {
  const token = jwt.sign(
    { tv: user.tokenVersion } satisfies Omit<SessionClaims, 'sub' | 'exp'>,
    ctx.config.jwtSecret,
    {
      subject: String(user.id),
      expiresIn: `${ctx.config.sessionHours}h`,
      algorithm: 'HS256',
      // every token is its own, so signing one session out never ends another made the same second
      jwtid: crypto.randomBytes(12).toString('base64url'),
    },
  );
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: 'lax',
    secure: ctx.config.cookieSecure,
    maxAge: ctx.config.sessionHours * 3600 * 1000,
    path: '/',
  });
}

export function clearSession(ctx: AppContext, res: Response) {
  res.clearCookie(SESSION_COOKIE, {
    httpOnly: true,
    sameSite: 'lax',
    secure: ctx.config.cookieSecure,
    path: '/',
  });
}

function verifiedToken(ctx: AppContext, req: Request): { token: string; claims: SessionClaims } | null {
  const token: unknown = req.cookies?.[SESSION_COOKIE];
  if (typeof token !== 'string' || !token) return null;
  try {
    const claims = jwt.verify(token, ctx.config.jwtSecret, { algorithms: ['HS256'] }) as SessionClaims;
    return { token, claims };
  } catch {
    // expired, forged or malformed: signed out
    return null;
  }
}

/**
 * Reads the session cookie; a valid token that was not signed out, whose user still exists, is
 * enabled and has the same token version, sets `req.user`. Anything else is treated as signed out
 * (routes decide whether that is 401). A token seen in the last few seconds is answered from the
 * session cache, which every sign-out and change to a person forgets (see session-cache.ts).
 */
export function sessionMiddleware(ctx: AppContext): RequestHandler {
  return (req, _res, next) => {
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    const held = typeof token === 'string' && token ? heldSessionUser(ctx.db, token) : null;
    if (held) {
      req.user = held;
      return next();
    }
    const session = verifiedToken(ctx, req);
    if (session && !isSessionRevoked(ctx.db, session.token)) {
      const user = findSessionUser(ctx.db, Number(session.claims.sub), session.claims.tv);
      if (user) {
        req.user = user;
        holdSessionUser(ctx.db, session.token, user, session.claims.exp * 1000);
      }
    }
    next();
  };
}

/** Signing out: the cookie is cleared and its token refused from now on, even if a copy of it was kept. */
export function endSession(ctx: AppContext, req: Request, res: Response) {
  const session = verifiedToken(ctx, req);
  if (session) revokeSession(ctx.db, session.token, new Date(session.claims.exp * 1000));
  clearSession(ctx, res);
}
