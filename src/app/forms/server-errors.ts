import type { FormGroup } from '@angular/forms';
import type { AppError } from '../errors/app-error';

/**
 * Puts each detail of a server error under the field it names (`details[].path`, whose first
 * segment is the control name, or `aliases[path]`). Returns the messages that fit no field, for
 * a message above the form.
 */
export function showServerErrors(
  form: FormGroup,
  error: AppError,
  aliases: Readonly<Record<string, string>> = {},
): string[] {
  const leftOver: string[] = [];
  for (const detail of error.details) {
    const name = aliases[detail.path] ?? detail.path.split('.')[0];
    const control = name ? form.get(name) : null;
    if (control) {
      control.setErrors({ server: detail.message });
      control.markAsTouched();
    } else {
      leftOver.push(detail.message);
    }
  }
  return leftOver;
}

/** Puts one message under one field (for error codes that concern a single field). */
export function showFieldError(form: FormGroup, name: string, message: string): void {
  const control = form.get(name);
  if (!control) throw new Error(`No control ${name}`);
  control.setErrors({ server: message });
  control.markAsTouched();
}

/**
 * Shows a failed submission: details under their fields, and returns what belongs above the
 * form (details that fit no field, or `message(error)` when there were no details), or null when
 * everything is shown under fields.
 */
export function formErrorMessage(
  form: FormGroup,
  error: AppError,
  message: (error: AppError) => string = (e) => e.message,
  aliases: Readonly<Record<string, string>> = {},
): string | null {
  const leftOver = showServerErrors(form, error, aliases);
  if (error.details.length > 0 && leftOver.length === 0) return null;
  return leftOver.length > 0 ? leftOver.join(' ') : message(error);
}
