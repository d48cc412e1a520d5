import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import type { z } from 'zod';

/**
 * Validates a control with a zod schema from `shared/schemas`, so the form and the server apply
 * the same rule and say it in the same words. Every error value is the message to show.
 * @param emptyMessage shown instead of the schema's message while the field is empty.
 */
export function zodValidator(schema: z.ZodType, emptyMessage?: string): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const value: unknown = control.value;
    if (emptyMessage !== undefined && (value === '' || value === null || value === undefined)) {
      // Not `required`: Angular's RequiredValidator (the `required` attribute) sets that key too.
      return { empty: emptyMessage };
    }
    const result = schema.safeParse(value);
    return result.success
      ? null
      : { invalid: result.error.issues[0]?.message ?? 'Check this field.' };
  };
}

/** Requires the value to equal that of the sibling control `other` (a password confirmation). */
export function matchesSibling(other: string, message: string): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const sibling = control.parent?.get(other);
    if (!sibling || control.value === '' || control.value === sibling.value) return null;
    return { mismatch: message };
  };
}
