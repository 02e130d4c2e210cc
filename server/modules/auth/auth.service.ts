import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import { and, eq, isNull, lt, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { passwordTokens, revokedSessions, users } from '../../db/schema';
import { HttpError } from '../../lib/http-error';
import type { User } from '@shared/schemas/auth';
import type { Role } from '@shared/auth/permissions';
import { forgetSessionToken, forgetSessionsOf } from './session-cache';

export const BCRYPT_COST = 10;
/** compared against when the e-mail is unknown, so both cases take the same time */
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST);

export const toPublicUser = (u: { id: number; email: string; name: string; role: Role }): User => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role,
});

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  tokenVersion: number;
}

export function findSessionUser(db: Db, id: number, tokenVersion: number): SessionUser | null {
  if (!Number.isInteger(id)) return null;
  const u = db.select().from(users).where(eq(users.id, id)).get();
  if (!u || u.disabled || u.tokenVersion !== tokenVersion) return null;
  return { id: u.id, email: u.email, name: u.name, role: u.role, tokenVersion: u.tokenVersion };
}

export async function verifyCredentials(db: Db, email: string, password: string) {
  const u = db.select().from(users).where(eq(users.email, email)).get();
  const ok = await bcrypt.compare(password, u?.passwordHash ?? DUMMY_HASH);
  if (!u || !u.passwordHash || !ok) throw new HttpError('UNAUTHENTICATED', 'Wrong e-mail or password.');
  if (u.disabled)
    throw new HttpError('UNAUTHENTICATED', 'This account is disabled. Ask your team lead to enable it.');
  return u;
}

/** Ends every session of the user: their token version no longer matches. */
export function endAllSessions(db: Db, userId: number) {
  db.update(users)
    .set({ tokenVersion: sql`${users.tokenVersion} + 1`, updatedAt: new Date().toISOString() })
    .where(eq(users.id, userId))
    .run();
  forgetSessionsOf(db, userId);
}

export const hashToken = (token: string) => crypto.createHash('sha256').update(token).digest('hex');

export function isSessionRevoked(db: Db, token: string): boolean {
  return (
    db
      .select({ h: revokedSessions.tokenHash })
      .from(revokedSessions)
      .where(eq(revokedSessions.tokenHash, hashToken(token)))
      .get() !== undefined
  );
}

/** Refuses this one token from now until it would have expired anyway; rows past that are dropped. */
export function revokeSession(db: Db, token: string, expiresAt: Date) {
  const now = new Date().toISOString();
  db.transaction((tx) => {
    tx.delete(revokedSessions).where(lt(revokedSessions.expiresAt, now)).run();
    tx.insert(revokedSessions)
      .values({ tokenHash: hashToken(token), expiresAt: expiresAt.toISOString() })
      .onConflictDoNothing()
      .run();
  });
  forgetSessionToken(db, token);
}

export function newToken(): string {
  return crypto.randomBytes(32).toString('base64url');
}

function findLiveToken(db: Db, token: string) {
  const row = db
    .select()
    .from(passwordTokens)
    .where(and(eq(passwordTokens.tokenHash, hashToken(token)), isNull(passwordTokens.usedAt)))
    .get();
  if (!row || row.expiresAt <= new Date().toISOString()) return null;
  return row;
}

export function getInvitation(db: Db, token: string) {
  const row = findLiveToken(db, token);
  const u = row && db.select().from(users).where(eq(users.id, row.userId)).get();
  if (!row || !u || u.disabled)
    throw new HttpError(
      'NOT_FOUND',
      'This link has expired or has already been used. Ask your team lead for a new one.',
    );
  return { email: u.email, name: u.name };
}

/** Sets the password from a single-use link; the token is spent and older sessions end. */
export async function setPasswordWithToken(db: Db, token: string, password: string) {
  const hash = await bcrypt.hash(password, BCRYPT_COST);
  const updated = db.transaction((tx) => {
    const row = findLiveToken(tx as unknown as Db, token);
    const u = row && tx.select().from(users).where(eq(users.id, row.userId)).get();
    if (!row || !u || u.disabled)
      throw new HttpError(
        'NOT_FOUND',
        'This link has expired or has already been used. Ask your team lead for a new one.',
      );
    const now = new Date().toISOString();
    tx.update(passwordTokens).set({ usedAt: now }).where(eq(passwordTokens.id, row.id)).run();
    tx.update(users)
      .set({ passwordHash: hash, tokenVersion: u.tokenVersion + 1, updatedAt: now })
      .where(eq(users.id, u.id))
      .run();
    return { ...u, tokenVersion: u.tokenVersion + 1 };
  });
  forgetSessionsOf(db, updated.id);
  return updated;
}
