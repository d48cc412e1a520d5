import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MarkdownComponent } from 'ngx-markdown';
import type { UnitComment } from '../../../shared/schemas/review';
import { STEP_NOTES, when } from './review-labels';

/**
 * Comments in the order given (oldest first, as the API answers), each body Markdown rendered
 * through ngx-markdown's default Angular sanitiser, so a comment can never run script.
 */
@Component({
  selector: 'app-comment-list',
  imports: [MarkdownComponent],
  template: `
    <ol class="comments">
      @for (c of comments(); track c.id) {
        <li>
          <p class="meta">
            <strong>{{ c.author?.name ?? 'A former member' }}</strong>
            @if (c.step) {
              {{ notes[c.step] }}
            }
            · {{ at(c.at) }}
            @if (c.lessonId && lessonTitle(c.lessonId); as title) {
              · on {{ title }}
            }
          </p>
          <markdown class="body" [data]="c.body" />
        </li>
      }
    </ol>
  `,
  styles: `
    .comments {
      list-style: none;
      padding: 0;
      margin: 0 0 1rem;
    }
    .comments li {
      border-inline-start: 3px solid var(--mat-sys-outline-variant);
      padding: 0.25rem 0 0.25rem 0.75rem;
      margin-bottom: 0.75rem;
    }
    .meta {
      margin: 0;
      font-size: 0.9rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CommentList {
  readonly comments = input.required<readonly UnitComment[]>();
  /** The unit's lessons, to say which one a comment is on; empty on a lesson's own page. */
  readonly lessons = input<readonly { id: string; title: string }[]>([]);

  protected readonly notes = STEP_NOTES;

  protected at(iso: string): string {
    return when(iso);
  }

  protected lessonTitle(id: string): string | null {
    return this.lessons().find((l) => l.id === id)?.title ?? null;
  }
}
