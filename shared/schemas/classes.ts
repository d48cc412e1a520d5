/** Classes: the groups of students a lesson is taught to. Used by the server and the client. */
import * as z from 'zod';
import { singleLine } from './text.js';
import { uuidSchema, whole } from './common.js';

/** Year 0 is the first year of school (Foundation, Reception or Kindergarten, by region). */
export const YEAR_LEVELS = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12] as const;

const classFields = {
  name: singleLine({ error: 'Enter a class name, like 4K.' })
    .trim()
    .min(1, { error: 'Enter a class name, like 4K.' })
    .max(40, { error: 'A class name is at most 40 characters.' }),
  yearLevel: whole(0, 12),
  studentCount: whole(1, 60),
  devices: whole(0, 200),
  /** Teachers of the school who teach the class. */
  teacherIds: z
    .array(uuidSchema, { error: 'Pick the class teachers.' })
    .max(20, { error: 'At most 20 teachers.' })
    .refine((ids) => new Set(ids).size === ids.length, { error: 'A teacher is listed twice.' }),
};

/** POST /api/classes. Without `teacherIds`, a teacher creating the class teaches it. */
export const classCreateSchema = z.object({
  ...classFields,
  teacherIds: classFields.teacherIds.optional(),
});
export type ClassCreate = z.input<typeof classCreateSchema>;

/** PATCH /api/classes/:id: any of the fields; `teacherIds` replaces the list. */
export const classUpdateSchema = z
  .object({
    name: classFields.name.optional(),
    yearLevel: classFields.yearLevel.optional(),
    studentCount: classFields.studentCount.optional(),
    devices: classFields.devices.optional(),
    teacherIds: classFields.teacherIds.optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), {
    error: 'Change at least one field.',
  });
export type ClassUpdate = z.input<typeof classUpdateSchema>;

export const classTeacherSchema = z.object({ id: z.string(), name: z.string(), email: z.string() });

export const classSchema = z.object({
  id: z.string(),
  name: z.string(),
  yearLevel: z.int(),
  studentCount: z.int(),
  devices: z.int(),
  teachers: z.array(classTeacherSchema),
  /** How many lessons are planned for the class (a class with lessons cannot be deleted). */
  lessonCount: z.int(),
});
export type SchoolClass = z.infer<typeof classSchema>;
export const classResponseSchema = z.object({ class: classSchema });
export const classListSchema = z.object({ classes: z.array(classSchema) });

/** Words for a year level: 0 is the first year of school. */
export function yearLevelLabel(level: number): string {
  return level === 0 ? 'Foundation' : `Year ${level}`;
}
