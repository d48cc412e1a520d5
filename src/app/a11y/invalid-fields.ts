import { afterEveryRender, DOCUMENT, inject } from '@angular/core';

/** A Material text field's input or textarea inside a field that shows its error state. */
const IN_ERROR = '.mat-form-field-invalid .mat-mdc-input-element';

/**
 * Every Material text field that shows its error gets `aria-invalid="true"` (WCAG 2.2 SC 3.3.1
 * Error Identification, SC 4.1.2 Name, Role, Value). matInput leaves the attribute out while a
 * required field is empty, even once it is touched and drawn in red with "Required" under it, so a
 * screen reader hears "required" but never "invalid". The form field's own error class is the
 * state the person sees (invalid and touched, or its form submitted); after each render the
 * input's attribute is made to say the same, and a field that leaves that state says "false".
 *
 * Call once in the root component's constructor: it covers every page and dialog, and so the
 * fields of every form, whichever component renders them.
 */
export function markInvalidFields(): void {
  const document = inject(DOCUMENT);
  const marked = new Set<HTMLElement>();
  afterEveryRender({
    write: () => {
      const shown = new Set(document.querySelectorAll<HTMLElement>(IN_ERROR));
      for (const input of shown) {
        if (input.getAttribute('aria-invalid') !== 'true')
          input.setAttribute('aria-invalid', 'true');
        marked.add(input);
      }
      for (const input of marked) {
        if (shown.has(input)) continue;
        marked.delete(input);
        // Material's own binding may still hold "no attribute" and so never write again.
        if (input.isConnected) input.setAttribute('aria-invalid', 'false');
      }
    },
  });
}
