import * as z from 'zod';
import { emailSchema, personNameSchema, roleSchema } from './common.js';

/** Password policy after NIST SP 800-63B §5.1.1: length only, no composition rules. */
export const PASSWORD_MIN = 8;
export const PASSWORD_MAX = 128;

/** A new password's shape; the common-password list is checked on the server. */
export const newPasswordSchema = z
  .string({ message: 'Enter a password.' })
  .min(PASSWORD_MIN, { message: `Use at least ${PASSWORD_MIN} characters.` })
  .max(PASSWORD_MAX, { message: `Use at most ${PASSWORD_MAX} characters.` });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ message: 'Enter your password.' }).min(1, 'Enter your password.').max(1024),
});
export type SignIn = z.infer<typeof signInSchema>;

/** The signed-in user as every auth route returns it. */
export const sessionUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  schoolId: z.string(),
  schoolName: z.string(),
});
export type SessionUser = z.infer<typeof sessionUserSchema>;
export const userResponseSchema = z.object({ user: sessionUserSchema });
/** GET /api/auth/session: the user, or null when signed out. */
export const sessionResponseSchema = z.object({ user: sessionUserSchema.nullable() });

export const resetRequestSchema = z.object({ email: emailSchema });
export const resetCompleteSchema = z.object({
  token: z.string().min(10, 'This link is not complete.').max(200),
  password: newPasswordSchema,
});

export const invitationInfoSchema = z.object({
  email: z.string(),
  role: roleSchema,
  schoolName: z.string(),
  expiresAt: z.string(),
});
export type InvitationInfo = z.infer<typeof invitationInfoSchema>;
export const acceptInvitationSchema = z.object({
  name: personNameSchema,
  password: newPasswordSchema,
});

export const accountUpdateSchema = z.object({ name: personNameSchema });
export const passwordChangeSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.').max(1024),
  newPassword: newPasswordSchema,
});
