import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { apiResource } from '../http/resource';
import { ReuseApi } from './reuse-api';

/**
 * On a copy: what changed in the original since it was copied, so its author can bring changes
 * over by hand. Says nothing when nothing changed or the original can no longer be read.
 */
@Component({
  selector: 'app-upstream-panel',
  imports: [MatIconModule],
  template: `
    @if (upstream.value(); as up) {
      @if (up.changed) {
        <section class="upstream" aria-labelledby="upstream-heading">
          <h2 id="upstream-heading">
            <mat-icon aria-hidden="true">update</mat-icon>
            The original changed since you copied it
          </h2>
          <p class="muted">
            “{{ up.basedOn.title }}” is at version {{ up.sourceVersion }} now (you copied version
            {{ up.basedOn.version }}). Bring over what you want by hand:
          </p>
          <ul>
            @for (c of up.changes; track $index) {
              <li>{{ c.summary }}</li>
            }
          </ul>
        </section>
      }
    }
  `,
  styles: `
    .upstream {
      border-inline-start: 4px solid var(--mat-sys-tertiary);
      padding: 0.25rem 1rem;
      margin: 1rem 0;
      background: var(--mat-sys-surface-container-low);
    }
    h2 {
      display: flex;
      align-items: center;
      gap: 0.5rem;
      font-size: 1.1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UpstreamPanel {
  private readonly api = inject(ReuseApi);

  /** The copy's id. */
  readonly unitId = input.required<string>();

  /** A 404 (the original gone or no longer shared) shows nothing: the provenance says so. */
  protected readonly upstream = apiResource({
    params: () => this.unitId(),
    load: (id) => this.api.upstream(id),
  });
}
