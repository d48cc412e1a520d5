import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { commentBodySchema } from '../../../shared/schemas/review';
import { Session } from '../auth/session';
import { apiResource } from '../http/resource';
import { CommentList } from './comment-list';
import { ReviewApi } from './review-api';

/**
 * A lesson's comments on its own page, oldest first, and a box to add one on this lesson. Anyone
 * who reads the unit may comment (API.md); a relief teacher reads the lesson only, so sees none.
 */
@Component({
  selector: 'app-lesson-comments',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, CommentList],
  template: `
    @if (!relief()) {
      <section class="lesson-comments" aria-labelledby="lesson-comments-heading">
        <h2 id="lesson-comments-heading">Comments on this lesson</h2>
        @if (comments(); as list) {
          @if (list.length) {
            <app-comment-list [comments]="list" />
          } @else {
            <p class="muted">No comments on this lesson yet.</p>
          }
        } @else if (read.error(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        } @else {
          <p class="muted">Loading comments…</p>
        }
        <mat-form-field class="wide" subscriptSizing="dynamic">
          <mat-label>Comment on this lesson</mat-label>
          <textarea matInput rows="3" [formControl]="text"></textarea>
          <mat-hint
            >Markdown: **bold**, lists with -. The unit's authors and others in its review get an
            e-mail.</mat-hint
          >
          @if (textError(); as message) {
            <mat-error>{{ message }}</mat-error>
          }
        </mat-form-field>
        @if (error(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        }
        <button matButton="outlined" type="button" [disabled]="busy()" (click)="add()">
          Add comment
        </button>
      </section>
    }
  `,
  styles: `
    .wide {
      width: 100%;
      margin-bottom: 0.5rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LessonComments {
  private readonly api = inject(ReviewApi);
  private readonly session = inject(Session);

  readonly unitId = input.required<string>();
  readonly lessonId = input.required<string>();

  protected readonly relief = computed(() => this.session.user()?.role === 'relief');
  protected readonly read = apiResource({
    params: () => (this.relief() ? undefined : this.unitId()),
    load: (id: string) => this.api.comments(id),
  });
  protected readonly comments = computed(() =>
    this.read.value()?.filter((c) => c.lessonId === this.lessonId()),
  );
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly textError = signal<string | null>(null);
  protected readonly text = new FormControl('', { nonNullable: true });

  protected add(): void {
    const result = commentBodySchema.safeParse(this.text.value);
    if (!result.success) {
      const message = result.error.issues[0]?.message ?? 'Check the comment.';
      this.textError.set(message);
      this.text.setErrors({ invalid: message });
      this.text.markAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.textError.set(null);
    this.api.comment(this.unitId(), result.data, this.lessonId()).subscribe({
      next: (c) => {
        this.busy.set(false);
        this.read.set([...(this.read.value() ?? []), c]);
        this.text.reset('');
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof Error ? e.message : 'The comment was not saved.');
      },
    });
  }
}
