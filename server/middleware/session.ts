import type { RequestHandler, Response } from 'express';
import jwt from 'jsonwebtoken';
import type { AppContext } from '../context';
import { findSessionUser } from '../modules/auth/auth.service';

export const SESSION_COOKIE = 'tw_session';

interface SessionClaims {
  sub: string;
  tv: number;
}

export function issueSession(ctx: AppContext, res: Response, user: { id: number; tokenVersion: number }) {
  const token = jwt.sign(
    { tv: user.tokenVersion } satisfies Omit<SessionClaims, 'sub'>,
    ctx.config.jwtSecret,
    {
      subject: String(user.id),
      expiresIn: `${ctx.config.sessionHours}h`,
      algorithm: 'HS256',
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

/**
 * Reads the session cookie; a valid token whose user still exists, is enabled and has the same token
 * version sets `req.user`. Anything else is treated as signed out (routes decide whether that is 401).
 */
export function sessionMiddleware(ctx: AppContext): RequestHandler {
  return (req, _res, next) => {
    const token: unknown = req.cookies?.[SESSION_COOKIE];
    if (typeof token !== 'string' || !token) return next();
    try {
      const claims = jwt.verify(token, ctx.config.jwtSecret, { algorithms: ['HS256'] }) as SessionClaims;
      const user = findSessionUser(ctx.db, Number(claims.sub), claims.tv);
      if (user) req.user = user;
    } catch {
      // expired, forged or malformed: signed out
    }
    next();
  };
}
