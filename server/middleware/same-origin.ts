import type { RequestHandler } from 'express';
import { HttpError } from '../lib/http-error';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function originOf(url: string): string {
  try {
    return new URL(url).origin;
  } catch {
    return url;
  }
}

/**
 * Cross-site request forgery: every state-changing request (anything but GET, HEAD, OPTIONS) that a
 * browser sends must come from our own pages. A browser says where a request comes from: current
 * ones send `Sec-Fetch-Site` on every request and `Origin` on every POST, PUT, PATCH and DELETE;
 * scripts cannot set either. So:
 * - `Sec-Fetch-Site: same-origin` → allowed (the browser vouches for it, whichever host name the
 *   app was opened under);
 * - else an `Origin` → allowed only when it is PUBLIC_ORIGIN's;
 * - else a `Sec-Fetch-Site` (`same-site`, `cross-site`, `none`) → refused: another port or a sibling
 *   host is same-site, not same-origin;
 * - neither header → allowed: not a browser (a script, curl, a test client), which has no one's
 *   session cookie to abuse.
 * Refusals are 403 in the error shape, before any body is read.
 */
export function sameOriginWrites(publicOrigin: string): RequestHandler {
  const ours = originOf(publicOrigin);
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const site = req.get('sec-fetch-site');
    const origin = req.get('origin');
    if (site === 'same-origin') return next();
    if (origin !== undefined ? origin === ours : site === undefined) return next();
    next(
      new HttpError(
        'FORBIDDEN',
        `This request came from ${origin ? `another site (${origin.slice(0, 200)})` : 'outside this app'}, so it was refused. Open Tetherwise at ${ours} and try again there.`,
      ),
    );
  };
}
