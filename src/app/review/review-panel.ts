import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import {
  commentBodySchema,
  type ReviewAction,
  type UnitComment,
} from '../../../shared/schemas/review';
import { UNIT_STATUS_LABELS, unitSchema, type Unit } from '../../../shared/schemas/units';
import { REVIEW_CONFLICTS, staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { ReviewApi } from './review-api';
import { CommentList } from './comment-list';
import { STEP_BUTTONS, STEP_NOTES } from './review-labels';

/**
 * A unit's review beside the unit: its status, the steps the signed-in person may take, and the
 * comments in order (Markdown, sanitised: see CommentList), a comment on the unit or one of its
 * lessons. The lesson page shows its own comments (LessonComments).
 */
@Component({
  selector: 'app-review-panel',
  imports: [
    ReactiveFormsModule,
    CommentList,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
  ],
  template: `
    <section class="review" aria-labelledby="review-heading">
      <h2 id="review-heading" tabindex="-1">Review</h2>
      <p>
        Status: <strong class="status">{{ statusLabels[unit().status] }}</strong>
      </p>
      @if (unit().status === 'endorsed' && unit().canEdit) {
        <p class="muted">Editing an endorsed unit or its lessons puts it back to draft.</p>
      }

      @if (comments().length) {
        <app-comment-list [comments]="comments()" [lessons]="lessons()" />
      } @else if (loaded()) {
        <p class="muted">No comments yet.</p>
      }

      <mat-form-field class="wide">
        <mat-label>{{ actions().length ? 'Comment or message' : 'Comment' }}</mat-label>
        <textarea matInput rows="3" [formControl]="text"></textarea>
        <mat-hint>Markdown: **bold**, lists with -.</mat-hint>
        @if (textError(); as message) {
          <mat-error>{{ message }}</mat-error>
        }
      </mat-form-field>
      @if (lessons().length) {
        <mat-form-field class="about" floatLabel="always">
          <mat-label>About</mat-label>
          <mat-select placeholder="The whole unit" [formControl]="about">
            <mat-option [value]="null">The whole unit</mat-option>
            @for (l of lessons(); track l.id) {
              <mat-option [value]="l.id">{{ l.title }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
      }
      @if (error(); as message) {
        <p class="form-error" role="alert">{{ message }}</p>
      }
      <div class="actions">
        <button matButton="outlined" type="button" [disabled]="busy()" (click)="addComment()">
          Add comment
        </button>
        @for (a of actions(); track a) {
          <button
            [matButton]="a === 'reopen' ? 'outlined' : 'filled'"
            type="button"
            [disabled]="busy()"
            (click)="take(a)"
          >
            {{ buttons[a] }}
          </button>
        }
      </div>
      @if (stepHint(); as hint) {
        <p class="muted hint">{{ hint }}</p>
      }
    </section>
  `,
  styles: `
    .wide {
      width: 100%;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem;
    }
    .hint {
      font-size: 0.9rem;
    }
    .about {
      margin-top: 0.5rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewPanel {
  private readonly api = inject(ReviewApi);
  private readonly notifier = inject(Notifier);

  readonly unit = input.required<Unit>();
  /** The steps the signed-in person may take now. */
  readonly actions = input<readonly ReviewAction[]>([]);
  /** Emits the unit after a step (or as it now is, after a 409). */
  readonly changed = output<Unit>();

  protected readonly statusLabels = UNIT_STATUS_LABELS;
  protected readonly buttons = STEP_BUTTONS;
  /** The unit's comments, read again after a step (a step's comment joins them). */
  private readonly read = apiResource({
    params: () => this.unit().id,
    load: (id: string) => this.api.comments(id),
  });
  protected readonly comments = computed<readonly UnitComment[]>(() => this.read.value() ?? []);
  /** Whether the first read has answered (a failed one too: the box still works). */
  protected readonly loaded = computed(
    () => this.read.value() !== undefined || this.read.error() !== null,
  );
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly textError = signal<string | null>(null);
  protected readonly lessons = computed(() => this.unit().lessons);
  /** What the buttons do with the text in the box (a step carries it as its comment). */
  protected readonly stepHint = computed(() => {
    const actions = this.actions();
    if (actions.includes('request-changes'))
      return 'Request changes needs a comment saying what to change; a comment written before Endorse goes with it. Add comment only comments, without deciding.';
    if (actions.includes('submit'))
      return 'A message written here goes to the reviewers with Send for review.';
    if (actions.includes('reopen'))
      return 'Reopen returns the unit to draft, so it can be changed and sent for review again.';
    return null;
  });

  protected readonly text = new FormControl('', { nonNullable: true });
  protected readonly about = new FormControl<string | null>(null);

  /**
   * The comment box's text when valid (undefined when empty and not required), else null with
   * the schema's message shown under the box.
   */
  private validText(required: boolean): string | null | undefined {
    const value = this.text.value;
    if (!required && value.trim() === '') return undefined;
    const result = commentBodySchema.safeParse(value);
    if (result.success) return value;
    const message = result.error.issues[0]?.message ?? 'Check the comment.';
    this.textError.set(message);
    this.text.setErrors({ invalid: message });
    this.text.markAsTouched();
    return null;
  }

  protected addComment(): void {
    const body = this.validText(true);
    if (!body) return;
    const lessonId = this.about.value;
    this.busy.set(true);
    this.error.set(null);
    this.api.comment(this.unit().id, body, lessonId).subscribe({
      next: (c) => {
        this.busy.set(false);
        this.read.set([...this.comments(), c]);
        this.text.reset('');
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof Error ? e.message : 'Not saved.');
      },
    });
  }

  protected take(action: ReviewAction): void {
    const comment = this.validText(action === 'request-changes');
    if (comment === null) {
      if (action === 'request-changes') this.error.set('Say what should change in the comment.');
      return;
    }
    const unit = this.unit();
    this.busy.set(true);
    this.error.set(null);
    this.api.step(unit.id, action, unit.version, comment).subscribe({
      next: (updated) => {
        this.busy.set(false);
        this.text.reset('');
        this.notifier.info(
          `${STEP_NOTES[action][0]!.toUpperCase()}${STEP_NOTES[action].slice(1)}.`,
        );
        // The parent shows the new unit; the step's comment is read with the others.
        this.changed.emit(updated);
        this.read.refresh();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.error.set(e instanceof Error ? e.message : 'Not saved.');
        // A 409 carries the unit as it now is: show that, so the buttons match its status, and
        // the comments of whoever moved it on.
        const current = staleConflict(e, unitSchema, REVIEW_CONFLICTS)?.current;
        if (current) {
          this.changed.emit(current);
          this.read.refresh();
        }
      },
    });
  }
}
