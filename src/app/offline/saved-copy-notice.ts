import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { savedLabel } from './saved-copy';

/**
 * Says that a page shows a copy saved in this browser, and from when. The status region is
 * always in the page, so a screen reader announces the words politely when they appear
 * (WAI-ARIA 1.2, role "status": an implicit aria-live of "polite").
 */
@Component({
  selector: 'app-saved-copy-notice',
  imports: [MatIconModule],
  template: `
    <div role="status">
      @if (savedAt() !== null) {
        <p class="saved">
          <mat-icon aria-hidden="true">cloud_off</mat-icon>
          <span>{{ words() }}</span>
        </p>
      }
    </div>
  `,
  styles: `
    .saved {
      display: flex;
      gap: 8px;
      align-items: center;
      padding: 8px 12px;
      border: 2px solid currentColor;
      border-radius: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SavedCopyNotice {
  /** When the copy shown was saved (ISO 8601), '' when not known, null when the page is live. */
  readonly savedAt = input<string | null>(null);

  protected readonly words = computed(() => {
    const at = this.savedAt();
    return at
      ? `You are offline. This is the copy saved in this browser on ${savedLabel(at)}.`
      : 'You are offline. This is a copy saved in this browser.';
  });
}
