import * as z from 'zod';
import { singleLine } from './text.js';

/** The four roles a member of a school can hold. */
export const ROLES = ['admin', 'lead', 'teacher', 'relief'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Words a teacher reads for each role. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'School admin',
  lead: 'Curriculum lead',
  teacher: 'Teacher',
  relief: 'Relief teacher',
};

/** A whole number in [min, max] with a message an admin can read (the forms' one number rule). */
export function whole(min: number, max: number) {
  const message = `Use a whole number from ${min} to ${max}.`;
  // One refinement rather than z.int().min().max(): one message per field, and z.int() stops
  // every later check of the form (the cross-field rules too) when it fails.
  return z
    .number({ error: message })
    .refine((v) => Number.isInteger(v) && v >= min && v <= max, { error: message });
}

export const uuidSchema = z.uuid({ message: 'Must be a valid id.' });
export const idParamsSchema = z.object({ id: uuidSchema });

/** One problem with a request, pointing at the field it concerns. */
export interface ApiErrorDetail {
  /** Dotted path of the field (`materials.0.qty`), empty for the whole body. */
  path: string;
  message: string;
  /** 1-based line of an uploaded file, for CSV row errors. */
  line?: number;
  /** Column name of an uploaded file, for CSV row errors. */
  column?: string;
}

/** The one error shape every failed API call answers with. */
export interface ApiErrorBody {
  error: { code: string; message: string; details?: ApiErrorDetail[]; current?: unknown };
}

export const emailSchema = singleLine({ message: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, { message: 'An e-mail address is at most 254 characters.' })
  .pipe(z.email({ message: 'Enter a valid e-mail address, like name@school.example.' }));

export const personNameSchema = singleLine({ message: 'Enter a name.' })
  .trim()
  .min(1, { message: 'Enter a name.' })
  .max(120, { message: 'A name is at most 120 characters.' });
