import type { Db } from '../../db/client';
import type { SessionUser } from './auth.service';

/**
 * Signed-in people as their session token last resolved, for a few seconds: a request then costs
 * one map lookup instead of a signature check, a revocation lookup and a user lookup. Every write
 * that can change what a token stands for forgets it at once (signing out forgets the token; a role
 * change, disabling, a new password or "sign out everywhere" forget every token of that person), so
 * the time to live only bounds what no code path here can see (someone editing the database by hand).
 */
export const SESSION_CACHE_TTL_MS = 5_000;
/** tokens held at the most; past it the oldest go first */
export const SESSION_CACHE_SIZE = 10_000;

interface Held {
  user: SessionUser;
  /** when this entry must be looked up again: the time to live, or the token's own expiry if sooner */
  until: number;
}

// per database, so two apps in one process (tests) never see each other's sessions
const caches = new WeakMap<Db, Map<string, Held>>();

function cacheOf(db: Db): Map<string, Held> {
  let cache = caches.get(db);
  if (!cache) caches.set(db, (cache = new Map()));
  return cache;
}

export function heldSessionUser(db: Db, token: string, now = Date.now()): SessionUser | null {
  const cache = caches.get(db);
  const held = cache?.get(token);
  if (!held) return null;
  if (held.until > now) return held.user;
  cache!.delete(token);
  return null;
}

export function holdSessionUser(
  db: Db,
  token: string,
  user: SessionUser,
  expiresAtMs: number,
  now = Date.now(),
) {
  const cache = cacheOf(db);
  cache.delete(token);
  cache.set(token, {
    user: Object.freeze({ ...user }),
    until: Math.min(now + SESSION_CACHE_TTL_MS, expiresAtMs),
  });
  while (cache.size > SESSION_CACHE_SIZE) cache.delete(cache.keys().next().value!);
}

export function forgetSessionToken(db: Db, token: string) {
  caches.get(db)?.delete(token);
}

export function forgetSessionsOf(db: Db, userId: number) {
  const cache = caches.get(db);
  if (!cache) return;
  for (const [token, held] of cache) if (held.user.id === userId) cache.delete(token);
}
