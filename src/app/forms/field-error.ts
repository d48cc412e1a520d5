import { Pipe, type PipeTransform } from '@angular/core';
import type { ValidationErrors } from '@angular/forms';

/**
 * The message to show under a field: the first error whose value is a string (every Trayplan
 * validator and the server errors put their message there).
 */
@Pipe({ name: 'fieldError' })
export class FieldErrorPipe implements PipeTransform {
  transform(errors: ValidationErrors | null | undefined): string {
    if (!errors) return '';
    for (const value of Object.values(errors)) {
      if (typeof value === 'string') return value;
    }
    return 'Check this field.';
  }
}
