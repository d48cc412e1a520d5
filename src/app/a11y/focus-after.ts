import { afterNextRender, ElementRef, inject, Injector } from '@angular/core';

/** Where focus goes: a selector inside the component's host, or a function finding the element. */
export type FocusTarget = string | (() => HTMLElement | null | undefined);

/**
 * "Focus this after the view updates" (WCAG 2.2 SC 2.4.3 Focus Order). When an action disables
 * or removes the control that had focus (`@if`, a busy `[disabled]`), the browser drops focus to
 * the page and the next Tab restarts at the top. Call the returned function right after changing
 * the state: it waits for Angular's next render, so the element the state brings exists, then
 * focuses it. A target that is not focusable by nature needs `tabindex="-1"`.
 *
 * Call `focusAfter()` in an injection context (a field initialiser or the constructor).
 */
export function focusAfter(): (target: FocusTarget) => void {
  const injector = inject(Injector);
  const host = inject<ElementRef<HTMLElement>>(ElementRef).nativeElement;
  return (target) => {
    afterNextRender(
      {
        read: () => {
          const element =
            typeof target === 'string' ? host.querySelector<HTMLElement>(target) : target();
          element?.focus();
        },
      },
      { injector },
    );
  };
}
