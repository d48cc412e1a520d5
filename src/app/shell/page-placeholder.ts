import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/**
 * A page whose screens are not built yet: its heading and one sentence on what it is for.
 * The inputs come from the route's `data` (router `withComponentInputBinding`).
 */
@Component({
  selector: 'app-page-placeholder',
  template: `
    <section class="page">
      <h1>{{ heading() }}</h1>
      <p class="muted">{{ purpose() }}</p>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PagePlaceholder {
  readonly heading = input.required<string>();
  readonly purpose = input.required<string>();
}
