import { effect, inject } from '@angular/core';
import { Title } from '@angular/platform-browser';

/**
 * Names the item a page shows in the document title once it has loaded ("Build the rover ·
 * Lesson · Trayplan"), so a tab, a history entry and a screen reader's page announcement say
 * which lesson or unit it is (WCAG 2.2 SC 2.4.2 Page Titled). Until then the route's title
 * ("Lesson · Trayplan") stands. Call in a component's injection context.
 */
export function itemTitle(kind: string, name: () => string | null | undefined): void {
  const title = inject(Title);
  effect(() => {
    const item = name();
    if (item) title.setTitle(`${item} · ${kind} · Trayplan`);
  });
}
