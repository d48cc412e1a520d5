import type { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { FormArray, FormGroup } from '@angular/forms';
import type { z } from 'zod';

/** The dotted path of a control inside its root form (`terms.0.endsOn`); '' for the root. */
export function pathOf(control: AbstractControl): string {
  const parts: string[] = [];
  let child = control;
  let parent = child.parent;
  while (parent) {
    const controls =
      parent instanceof FormArray || parent instanceof FormGroup
        ? (parent.controls as Record<string, AbstractControl> | AbstractControl[])
        : {};
    const key = Object.entries(controls).find(([, c]) => c === child)?.[0];
    if (key === undefined) return '';
    parts.unshift(key);
    child = parent;
    parent = child.parent;
  }
  return parts.join('.');
}

/**
 * Validates a whole form with one zod schema, so the rules between fields (terms that overlap,
 * a period ending before it starts, a date listed twice) land under the field the schema names,
 * in the schema's words. Every control of the form gets `validator`; the issues are computed once
 * per form value. Server `details` are kept here too, until their field is edited.
 */
export class SchemaIssues {
  private key = '';
  private issues = new Map<string, string>();
  /** Server messages by path, with the value the field had when the server answered. */
  private readonly server = new Map<string, { message: string; value: string }>();

  constructor(
    private readonly schema: z.ZodType,
    /** Turns the root form's raw value into what the schema parses. */
    private readonly toInput: (raw: unknown) => unknown,
  ) {}

  /** The validator to give every control below the root. */
  readonly validator: ValidatorFn = (control): ValidationErrors | null => {
    if (!control.parent) return null;
    const path = pathOf(control);
    if (!path) return null;
    const saved = this.server.get(path);
    if (saved) {
      if (saved.value === JSON.stringify(control.value)) return { server: saved.message };
      this.server.delete(path);
    }
    const message = this.messages(control.root).get(path);
    return message ? { invalid: message } : null;
  };

  /** Every issue of the form's current value, by path. */
  messages(root: AbstractControl): ReadonlyMap<string, string> {
    const raw: unknown = root.getRawValue();
    const key = JSON.stringify(raw);
    if (key !== this.key) {
      this.key = key;
      this.issues = new Map();
      const result = this.schema.safeParse(this.toInput(raw));
      if (!result.success) {
        for (const issue of result.error.issues) {
          const path = issue.path.map(String).join('.');
          if (!this.issues.has(path)) this.issues.set(path, issue.message);
        }
      }
    }
    return this.issues;
  }

  /**
   * Puts server details under the controls they name. Returns the messages that name no control.
   */
  showServer(
    root: AbstractControl,
    details: readonly { path: string; message: string }[],
  ): string[] {
    const leftOver: string[] = [];
    for (const detail of details) {
      const control = detail.path ? root.get(detail.path) : null;
      if (!control || control === root) {
        leftOver.push(detail.message);
        continue;
      }
      this.server.set(detail.path, {
        message: detail.message,
        value: JSON.stringify(control.value),
      });
      control.markAsTouched();
    }
    revalidate(root);
    return leftOver;
  }

  /** Forgets server messages (after a reload). */
  clearServer(): void {
    this.server.clear();
  }
}

/**
 * Re-runs every validator below and including `control`, children first, without events: an
 * edit of one term can make another one valid or invalid.
 */
export function revalidate(control: AbstractControl): void {
  if (control instanceof FormGroup || control instanceof FormArray) {
    for (const child of Object.values(control.controls as Record<string, AbstractControl>)) {
      revalidate(child);
    }
  }
  control.updateValueAndValidity({ onlySelf: true, emitEvent: false });
}
