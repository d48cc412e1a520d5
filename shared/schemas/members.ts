import * as z from 'zod';
import { emailSchema, roleSchema } from './common.js';

export const MEMBER_STATUSES = ['active', 'invited', 'deactivated'] as const;
export const memberStatusSchema = z.enum(MEMBER_STATUSES);
export type MemberStatus = z.infer<typeof memberStatusSchema>;

export const memberSchema = z.object({
  id: z.string(),
  name: z.string(),
  email: z.string(),
  role: roleSchema,
  status: memberStatusSchema,
  /** ISO 8601 with offset, or null when never signed in. */
  lastSignInAt: z.string().nullable(),
  /** ISO 8601, when a pending invitation runs out; null otherwise. */
  invitationExpiresAt: z.string().nullable(),
});
export type Member = z.infer<typeof memberSchema>;
export const memberListSchema = z.object({ members: z.array(memberSchema) });

export const inviteSchema = z.object({ email: emailSchema, role: roleSchema });
export type Invite = z.infer<typeof inviteSchema>;

export const memberUpdateSchema = z
  .object({
    role: roleSchema.optional(),
    status: z.enum(['active', 'deactivated']).optional(),
  })
  .refine((v) => v.role !== undefined || v.status !== undefined, {
    message: 'Change the role or the status.',
  });

/** A message the development mail fake received. */
export const devMailSchema = z.object({
  id: z.string(),
  to: z.array(z.string()),
  from: z.string(),
  subject: z.string(),
  text: z.string(),
  receivedAt: z.string(),
  links: z.array(z.string()),
});
export type DevMail = z.infer<typeof devMailSchema>;
export const devMailListSchema = z.object({ messages: z.array(devMailSchema) });
