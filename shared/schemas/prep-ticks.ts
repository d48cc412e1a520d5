/**
 * Prep-task ticks: a lesson's prep tasks ticked done, shared by the lesson's teachers (its unit's
 * authors and its relief teacher). A tick belongs to the task's `key` in the plan, so it stays
 * on "charge the controllers" when the number of controllers changes.
 */
import * as z from 'zod';
import { singleLine } from './text.js';

/** One ticked task: when and by whom (null once that member is gone). */
export const prepTickSchema = z.object({
  taskKey: z.string(),
  at: z.string(),
  by: z.object({ id: z.string(), name: z.string() }).nullable(),
});
export type PrepTick = z.infer<typeof prepTickSchema>;

/** GET and PUT /api/lessons/:id/prep/ticks: the ticks of the tasks in the plan as stored now. */
export const prepTicksSchema = z.object({ ticks: z.array(prepTickSchema) });
export type PrepTicks = z.infer<typeof prepTicksSchema>;

/**
 * PUT /api/lessons/:id/prep/ticks: set (`done: true`) or clear one task's tick. No version: the
 * same request twice leaves the same state, and two teachers ticking the same task agree.
 */
export const prepTickUpdateSchema = z.strictObject({
  taskKey: singleLine({ error: 'Name the task by its key.' })
    .min(1, { error: 'Name the task by its key.' })
    .max(200, { error: 'A task key has at most 200 characters.' }),
  done: z.boolean({ error: 'done is true or false.' }),
});
export type PrepTickUpdate = z.infer<typeof prepTickUpdateSchema>;
