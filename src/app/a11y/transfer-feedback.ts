import { LiveAnnouncer } from '@angular/cdk/a11y';
import { inject } from '@angular/core';
import { focusAfter, type FocusTarget } from './focus-after';

/**
 * What a screen reader hears around a download or print (WCAG 2.2 SC 4.1.3 Status Messages): a
 * progress bar appearing or going away says nothing by itself. After the end focus returns to the
 * button that started it (SC 2.4.3), which was disabled meanwhile.
 *
 * Call `transferFeedback()` in an injection context.
 */
export function transferFeedback() {
  const announcer = inject(LiveAnnouncer);
  const focus = focusAfter();
  return {
    started(what: string): void {
      void announcer.announce(`Making ${what}…`);
    },
    finished(what: string, button: FocusTarget): void {
      void announcer.announce(`${capitalised(what)} is ready: it is downloading.`);
      focus(button);
    },
    /** The error interceptor has shown the reason; focus still goes back to the button. */
    failed(button: FocusTarget): void {
      focus(button);
    },
  };
}

function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
