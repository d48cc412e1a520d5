import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { HttpClient } from '@angular/common/http';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { parseWith } from '../errors/parse';
import { Notifier } from '../errors/notifier';
import { calendarFeedSchema } from '../../../shared/schemas/sharing';

/**
 * The account page's calendar feed: a private address a calendar app subscribes to, with the
 * person's prep tasks of the next eight weeks. Making a new one stops the old one.
 */
@Component({
  selector: 'app-calendar-feed',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <h2>Calendar feed</h2>
    <p class="muted">
      Subscribe to your prep tasks (today to eight weeks ahead, with reminders) in your calendar
      app. Keep the address private. Making a new address stops the old one.
    </p>
    <button matButton="outlined" type="button" (click)="make()" [disabled]="busy()">
      <mat-icon aria-hidden="true">event</mat-icon>
      Make a new calendar address
    </button>
    @if (url(); as u) {
      <p role="status" class="url">
        Your calendar address (shown only now): <code>{{ u }}</code>
        <button matButton type="button" (click)="copy(u)">Copy</button>
      </p>
    }
  `,
  styles: `
    .url code {
      word-break: break-all;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalendarFeed {
  private readonly http = inject(HttpClient);
  private readonly notifier = inject(Notifier);

  protected readonly url = signal<string | null>(null);
  protected readonly busy = signal(false);

  protected make(): void {
    this.busy.set(true);
    this.http
      .post('/api/account/calendar-feed', {})
      .pipe(parseWith(calendarFeedSchema))
      .subscribe({
        next: ({ url }) => {
          this.busy.set(false);
          this.url.set(url);
        },
        error: (e: unknown) => {
          this.busy.set(false);
          this.notifier.errorNotShownYet(e);
        },
      });
  }

  protected copy(url: string): void {
    void navigator.clipboard?.writeText(url).then(() => this.notifier.info('Address copied.'));
  }
}
