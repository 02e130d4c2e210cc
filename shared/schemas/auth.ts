import { z } from 'zod';
import { ROLES } from '../auth/permissions';

export const RoleSchema = z.enum(ROLES);

export const EmailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254)
  .pipe(z.email('enter a valid e-mail address'));

/** Long passphrases are encouraged; 72 bytes is where bcrypt stops reading. */
export const PasswordSchema = z
  .string()
  .min(10, 'use at least 10 characters')
  .max(72, 'use at most 72 characters');

export const SignInInputSchema = z.strictObject({
  email: EmailSchema,
  password: z.string().min(1, 'enter your password').max(200),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

export const UserSchema = z.object({
  id: z.number().int(),
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
});
export type User = z.infer<typeof UserSchema>;

/** What an admin sees in the People list. */
export const UserAdminViewSchema = UserSchema.extend({
  disabled: z.boolean(),
  /** true while the person has not yet set a password from their invitation */
  invitePending: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type UserAdminView = z.infer<typeof UserAdminViewSchema>;

export const InviteUserInputSchema = z.strictObject({
  email: EmailSchema,
  name: z.string().trim().min(1, 'enter a name').max(120),
  role: RoleSchema,
});
export type InviteUserInput = z.infer<typeof InviteUserInputSchema>;

export const UpdateUserInputSchema = z
  .strictObject({
    role: RoleSchema.optional(),
    disabled: z.boolean().optional(),
    name: z.string().trim().min(1).max(120).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'nothing to change');
export type UpdateUserInput = z.infer<typeof UpdateUserInputSchema>;

export const SetPasswordInputSchema = z.strictObject({
  token: z.string().min(16).max(200),
  password: PasswordSchema,
});
export type SetPasswordInput = z.infer<typeof SetPasswordInputSchema>;

export const MailboxMessageSchema = z.object({
  to: z.string(),
  subject: z.string(),
  text: z.string(),
  receivedAt: z.string(),
});
export type MailboxMessage = z.infer<typeof MailboxMessageSchema>;

export const IdParamsSchema = z.object({ id: z.coerce.number().int().positive() });
