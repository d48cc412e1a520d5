import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Activity } from '../../../shared/schemas/lessons';

/**
 * The lesson page's build instructions: every activity's attachments, each downloadable, so
 * nobody has to open the activity editor to find them. The lesson pack prints them too.
 */
@Component({
  selector: 'app-build-instructions',
  template: `
    @if (withFiles().length) {
      <h2>Build instructions</h2>
      <ul class="instructions">
        @for (activity of withFiles(); track activity.id) {
          <li>
            <strong>{{ activity.title }}</strong>
            <ul>
              @for (file of activity.attachments; track file.id) {
                <li>
                  <a [href]="'/api/activities/attachments/' + file.id" download>{{
                    file.filename
                  }}</a>
                  <span class="muted"> ({{ size(file.size) }})</span>
                </li>
              }
            </ul>
          </li>
        }
      </ul>
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BuildInstructions {
  readonly activities = input.required<readonly Activity[]>();

  protected readonly withFiles = computed(() =>
    this.activities().filter((a) => a.attachments.length > 0),
  );

  protected size(bytes: number): string {
    return bytes >= 1024 * 1024
      ? `${(bytes / 1024 / 1024).toFixed(1)} MB`
      : `${Math.max(1, Math.round(bytes / 1024))} kB`;
  }
}
