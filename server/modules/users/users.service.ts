import { asc, eq, sql } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { passwordTokens, users } from '../../db/schema';
import { HttpError } from '../../lib/http-error';
import type { InviteUserInput, UpdateUserInput, UserAdminView } from '@shared/schemas/auth';
import { hashToken, newToken, toPublicUser } from '../auth/auth.service';
import { forgetSessionsOf } from '../auth/session-cache';
import { recordActivity } from '../activity/activity.service';

export const INVITE_HOURS = 72;

function toAdminView(u: typeof users.$inferSelect): UserAdminView {
  return {
    ...toPublicUser(u),
    disabled: u.disabled,
    invitePending: u.passwordHash === null,
    createdAt: u.createdAt,
    updatedAt: u.updatedAt,
  };
}

export function listUsers(db: Db): UserAdminView[] {
  return db.select().from(users).orderBy(asc(users.name)).all().map(toAdminView);
}

function createPasswordToken(db: Db, userId: number, createdBy: number) {
  const token = newToken();
  db.insert(passwordTokens)
    .values({
      userId,
      tokenHash: hashToken(token),
      purpose: 'invite',
      expiresAt: new Date(Date.now() + INVITE_HOURS * 3600 * 1000).toISOString(),
      createdBy,
    })
    .run();
  return token;
}

async function sendInvitation(
  ctx: AppContext,
  user: { email: string; name: string },
  token: string,
  inviter: string,
) {
  const link = `${ctx.config.publicOrigin}/set-password?token=${encodeURIComponent(token)}`;
  await ctx.mailer.send({
    to: user.email,
    subject: 'You are invited to Tetherwise',
    text: [
      `Hello ${user.name},`,
      '',
      `${inviter} has invited you to Tetherwise, the EVA planning workspace of your team.`,
      `Set your password here (the link works once and expires in ${INVITE_HOURS} hours):`,
      '',
      link,
      '',
      'If you did not expect this, you can ignore this message.',
    ].join('\n'),
  });
}

export async function inviteUser(
  ctx: AppContext,
  input: InviteUserInput,
  inviter: { id: number; name: string },
) {
  const { user, token } = ctx.db.transaction((tx) => {
    const existing = tx.select({ id: users.id }).from(users).where(eq(users.email, input.email)).get();
    if (existing)
      throw new HttpError('CONFLICT', `Someone with the e-mail ${input.email} is already on the team.`);
    const created = tx
      .insert(users)
      .values({ email: input.email, name: input.name, role: input.role })
      .returning()
      .get();
    return { user: created, token: createPasswordToken(tx as unknown as Db, created.id, inviter.id) };
  });
  recordActivity(ctx.db, {
    userId: inviter.id,
    kind: 'user.invited',
    summary: `${inviter.name} invited ${user.name} (${user.role})`,
    link: '/people',
  });
  await sendInvitation(ctx, user, token, inviter.name);
  return toAdminView(user);
}

export async function resendInvitation(
  ctx: AppContext,
  userId: number,
  inviter: { id: number; name: string },
) {
  const u = ctx.db.select().from(users).where(eq(users.id, userId)).get();
  if (!u) throw new HttpError('NOT_FOUND', 'No such person.');
  if (u.passwordHash !== null)
    throw new HttpError('VALIDATION_FAILED', `${u.name} has already set a password.`);
  if (u.disabled)
    throw new HttpError('VALIDATION_FAILED', `${u.name} is disabled; enable the account first.`);
  const token = createPasswordToken(ctx.db, u.id, inviter.id);
  await sendInvitation(ctx, u, token, inviter.name);
}

export function updateUser(db: Db, userId: number, input: UpdateUserInput, actor: { id: number }) {
  const view = db.transaction((tx) => {
    const u = tx.select().from(users).where(eq(users.id, userId)).get();
    if (!u) throw new HttpError('NOT_FOUND', 'No such person.');
    if (u.id === actor.id && (input.disabled === true || (input.role && input.role !== 'admin'))) {
      throw new HttpError('VALIDATION_FAILED', 'You cannot disable yourself or remove your own admin role.');
    }
    if (u.role === 'admin' && ((input.role && input.role !== 'admin') || input.disabled === true)) {
      const admins = tx
        .select({ n: sql<number>`count(*)` })
        .from(users)
        .where(sql`${users.role} = 'admin' and ${users.disabled} = 0`)
        .get();
      if ((admins?.n ?? 0) <= 1)
        throw new HttpError('VALIDATION_FAILED', 'The team needs at least one enabled admin.');
    }
    // a role change or disabling ends the person's sessions, so the new rights apply at once
    const endSessions = (input.role !== undefined && input.role !== u.role) || input.disabled === true;
    const updated = tx
      .update(users)
      .set({
        ...input,
        tokenVersion: endSessions ? u.tokenVersion + 1 : u.tokenVersion,
        updatedAt: new Date().toISOString(),
      })
      .where(eq(users.id, userId))
      .returning()
      .get();
    return toAdminView(updated);
  });
  // whatever changed (role, name, disabled), the next request reads the person afresh
  forgetSessionsOf(db, userId);
  return view;
}
