import * as z from 'zod';
import { crossCheck } from './checks.js';
import { prepInputSchema, type ValidPrepInput } from './schema.js';

/** Bad prep input: `issues` lists every problem found, each with the path of its field. */
export class PrepInputError extends Error {
  override readonly name = 'PrepInputError';

  constructor(readonly issues: z.core.$ZodIssue[]) {
    super(PrepInputError.describe(issues));
  }

  /** One readable message listing every problem (`lesson.endsAt: The lesson must end ...`). */
  static describe(issues: readonly z.core.$ZodIssue[]): string {
    const lines = issues.map((i) => `${i.path.length ? i.path.join('.') : 'input'}: ${i.message}`);
    const count = issues.length === 1 ? '1 problem' : `${issues.length} problems`;
    return `The prep input has ${count}: ${lines.join(' ')}`;
  }
}

function issueKey(i: { path: PropertyKey[]; message: string }): string {
  return `${i.path.map(String).join('.')}\u0000${i.message}`;
}

/**
 * Parses and checks raw prep input, filling in defaults; throws `PrepInputError` listing every
 * problem. Zod skips refinements once a field has the wrong type, so the cross-field rules are
 * then run again on the raw input and their issues added.
 */
export function validatePrepInput(raw: unknown): ValidPrepInput {
  const result = prepInputSchema.safeParse(raw);
  if (result.success) return result.data;
  const issues = [...result.error.issues];
  const seen = new Set(issues.map(issueKey));
  for (const extra of crossCheck(raw)) {
    if (seen.has(issueKey(extra))) continue;
    seen.add(issueKey(extra));
    issues.push({ code: 'custom', input: undefined, ...extra });
  }
  throw new PrepInputError(issues);
}
