import { Directive, ElementRef, inject, input, signal, type OnDestroy } from '@angular/core';

/**
 * A box that scrolls sideways (a wide table, the timeline) becomes a named region that takes
 * focus while its content overflows, so keyboard users can scroll it with the arrow keys
 * (WCAG 2.2 SC 2.1.1 Keyboard, SC 1.4.10 Reflow; axe-core's scrollable-region-focusable). When
 * nothing overflows it adds no tab stop.
 */
@Directive({
  selector: '[appScrollRegion]',
  host: {
    '[attr.role]': "overflows() ? 'region' : null",
    '[attr.tabindex]': 'overflows() ? 0 : null',
    '[attr.aria-label]': 'overflows() ? appScrollRegion() : null',
  },
})
export class ScrollRegion implements OnDestroy {
  /** The region's name, e.g. "Pull list for group 3 (scrolls sideways)". */
  readonly appScrollRegion = input.required<string>();
  protected readonly overflows = signal(false);
  private readonly element = inject<ElementRef<HTMLElement>>(ElementRef).nativeElement;
  private readonly observer =
    typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(() => this.measure());

  constructor() {
    this.observer?.observe(this.element);
    // The content changes width too (rows arriving); a child's size change is seen through it.
    queueMicrotask(() => {
      const child = this.element.firstElementChild;
      if (child) this.observer?.observe(child);
      this.measure();
    });
  }

  private measure(): void {
    this.overflows.set(this.element.scrollWidth > this.element.clientWidth + 1);
  }

  ngOnDestroy(): void {
    this.observer?.disconnect();
  }
}
