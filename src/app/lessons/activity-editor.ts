import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { FormArray, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import type { Part } from '../../../shared/schemas/kits';
import {
  ACTIVITY_KIND_LABELS,
  ACTIVITY_KINDS,
  activityKindSchema,
  activitySchema,
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_TYPES,
  type Activity,
  type ActivityKind,
  type Attachment,
} from '../../../shared/schemas/lessons';
import { requiredText, wholeNumber } from '../../../shared/schemas/units';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { confirm } from '../forms/confirm-dialog';
import { MatDialog } from '@angular/material/dialog';
import { focusAfter } from '../a11y/focus-after';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { confirmEndorsedEdit, endorsedDeleteNote } from '../review/endorsed-edit';
import { LessonFormApi } from './lesson-form-api';
import {
  materialRow,
  materialsFromForm,
  MaterialsEditor,
  type MaterialRowForm,
} from './materials-editor';
import { PluralPipe } from '../text/words';

/** Words for a file size ("2.4 MB"). */
export function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(0)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

/** The message of a refused upload, in a teacher's words. */
export function uploadMessage(error: unknown): string {
  if (!(error instanceof AppError)) return 'The upload failed. Try again.';
  if (error.status === 413)
    return 'That file is larger than 10 MB. Make it smaller, then try again.';
  if (error.status === 415) {
    return 'That file is not a PDF, PNG, JPEG or WebP file (checked from its contents), so it was not added.';
  }
  return error.message;
}

/**
 * Adds or edits one activity of a lesson: title, kind, planned minutes and its materials (saved
 * whole), and for a saved activity its attachments. A stale version is shown with Reload and
 * Re-apply; nothing is overwritten without the teacher choosing so.
 */
@Component({
  selector: 'app-activity-editor',
  imports: [
    PluralPipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MaterialsEditor,
    FieldErrorPipe,
  ],
  templateUrl: './activity-editor.html',
  styleUrl: './activity-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ActivityEditor {
  private readonly api = inject(LessonFormApi);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);
  private readonly focus = focusAfter();

  readonly lessonId = input.required<string>();
  /** The activity to edit, or null to add a new one at the end of the lesson. */
  readonly activity = input<Activity | null>(null);
  readonly parts = input.required<readonly Part[]>();
  readonly saved = output<Activity>();
  /** The editor is done: true when the activity was deleted, false when it was closed. */
  readonly closed = output<boolean>();
  /** The unit's title while it is endorsed: a change is asked about first (it returns to draft). */
  readonly endorsedUnit = input<string | null>(null);
  /** After any change saved (the activity, a delete, an attachment): the unit is a draft now. */
  readonly edited = output<void>();

  protected readonly kinds = ACTIVITY_KINDS;
  protected readonly kindLabels = ACTIVITY_KIND_LABELS;
  protected readonly accept = ATTACHMENT_TYPES.join(',');
  protected readonly saving = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly conflict = signal<Activity | null>(null);
  protected readonly attachments = signal<Attachment[]>([]);
  protected readonly uploadPercent = signal<number | null | undefined>(undefined);
  protected readonly uploadError = signal<string | null>(null);
  /** The version the form was read at (the newest saved one after each save). */
  private base: Activity | null = null;

  protected readonly form = inject(NonNullableFormBuilder).group({
    title: ['', zodValidator(requiredText('a title', 200))],
    kind: ['build' as ActivityKind, zodValidator(activityKindSchema)],
    minutes: [
      10 as number | null,
      zodValidator(
        wholeNumber(0, 480, 'Use a whole number of minutes from 0 to 480.'),
        'Enter the planned minutes.',
      ),
    ],
    materials: new FormArray<MaterialRowForm>([]),
  });

  constructor() {
    effect(() => {
      const activity = this.activity();
      const parts = this.parts();
      untracked(() => this.fill(activity, parts));
    });
  }

  /** Whether the form holds changes not saved yet. */
  isDirty(): boolean {
    return this.form.dirty;
  }

  protected uploadLabel(): string {
    const percent = this.uploadPercent();
    return percent === null ? 'Uploading' : `Uploading, ${percent ?? 0}%`;
  }

  protected size(bytes: number): string {
    return fileSize(bytes);
  }

  protected url(a: Attachment): string {
    return this.api.attachmentUrl(a.id);
  }

  private fill(activity: Activity | null, parts: readonly Part[]): void {
    this.base = activity;
    this.form.reset({
      title: activity?.title ?? '',
      kind: activity?.kind ?? 'build',
      minutes: activity?.minutes ?? 10,
    });
    const rows = this.form.controls.materials;
    rows.clear();
    for (const m of activity?.materials ?? []) rows.push(materialRow(parts, m));
    this.form.markAsPristine();
    this.attachments.set(activity?.attachments ?? []);
  }

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.formError.set('Check the fields marked below.');
      return;
    }
    confirmEndorsedEdit(this.dialog, this.endorsedUnit(), 'this activity').subscribe((yes) => {
      if (yes) this.send(this.base?.version ?? null);
    });
  }

  private send(version: number | null): void {
    const v = this.form.getRawValue();
    const body = {
      title: v.title.trim(),
      kind: v.kind,
      minutes: v.minutes ?? 0,
      materials: materialsFromForm(this.form.controls.materials),
    };
    this.saving.set(true);
    const request =
      this.base && version !== null
        ? this.api.updateActivity(this.base.id, { version, ...body })
        : this.api.createActivity(this.lessonId(), body);
    request.subscribe({
      next: (activity) => {
        this.saving.set(false);
        this.conflict.set(null);
        this.base = activity;
        this.form.markAsPristine();
        this.notifier.info(`“${activity.title}” is saved.`);
        this.edited.emit();
        this.saved.emit(activity);
        // Saving disabled the button, which dropped focus to the page (WCAG 2.2 SC 2.4.3). A new
        // activity's editor moves into the list: the lesson editor focuses it there.
        if (version !== null) this.focus('.save-activity');
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.focus('.save-activity');
        if (!(error instanceof AppError)) return this.notifier.errorNotShownYet(error);
        const current = staleConflict(error, activitySchema)?.current;
        if (current) return this.conflict.set(current);
        this.showDetails(error);
      },
    });
  }

  /** Details under their fields; `materials.2.partCode` goes under line 3's part. */
  private showDetails(error: AppError): void {
    const rest: AppError['details'][number][] = [];
    for (const d of error.details) {
      const [head, index, field] = d.path.split('.');
      const row = head === 'materials' ? this.form.controls.materials.at(Number(index)) : null;
      const control = row?.get(field === 'partCode' ? 'part' : (field ?? 'part'));
      if (control) {
        control.setErrors({ server: d.message });
        control.markAsTouched();
      } else {
        rest.push(d);
      }
    }
    const shown = new AppError(error.status, error.code, error.message, rest);
    const message =
      rest.length === 0 && error.details.length > 0 ? null : formErrorMessage(this.form, shown);
    this.formError.set(message);
  }

  /** After a 409: drop my changes and show the activity as it is now. */
  protected reload(): void {
    const current = this.conflict();
    if (!current) return;
    this.conflict.set(null);
    this.fill(current, this.parts());
    this.saved.emit(current);
  }

  /** After a 409: send my change again on top of the version the server has now. */
  protected reapply(): void {
    const current = this.conflict();
    if (!current) return;
    this.base = current;
    this.send(current.version);
  }

  protected remove(): void {
    const activity = this.base;
    if (!activity) return this.closed.emit(false);
    confirm(this.dialog, {
      title: 'Delete this activity?',
      message: `“${activity.title}” is deleted with its materials and attachments.${endorsedDeleteNote(this.endorsedUnit())}`,
      confirm: 'Delete activity',
      cancel: 'Keep it',
      danger: true,
    }).subscribe((yes) => {
      if (yes) this.deleteActivity(activity);
    });
  }

  private deleteActivity(activity: Activity): void {
    this.api.deleteActivity(activity.id, activity.version).subscribe({
      next: () => {
        this.form.markAsPristine();
        this.notifier.info(`“${activity.title}” is deleted.`);
        this.edited.emit();
        this.closed.emit(true);
      },
      error: (error: unknown) => {
        const current = staleConflict(error, activitySchema)?.current;
        if (current) return this.conflict.set(current);
        this.formError.set(error instanceof Error ? error.message : 'Not deleted.');
      },
    });
  }

  protected cancel(): void {
    this.fill(this.base, this.parts());
    this.closed.emit(false);
  }

  protected upload(event: Event): void {
    const field = event.target as HTMLInputElement;
    const file = field.files?.[0];
    field.value = '';
    const activity = this.base;
    if (!file || !activity) return;
    this.uploadError.set(null);
    // Checked here to save a long upload; the server checks again from the file's bytes.
    if (file.size > ATTACHMENT_MAX_BYTES) {
      this.uploadError.set(`“${file.name}” is ${fileSize(file.size)}; the limit is 10 MB.`);
      return;
    }
    confirmEndorsedEdit(this.dialog, this.endorsedUnit(), 'this attachment').subscribe((yes) => {
      if (yes) this.sendFile(activity, file);
    });
  }

  private sendFile(activity: Activity, file: File): void {
    this.uploadPercent.set(0);
    this.api.upload(activity.id, file).subscribe({
      next: (e) => {
        if (e.kind === 'progress') this.uploadPercent.set(e.percent);
        else {
          this.uploadPercent.set(undefined);
          this.attachments.update((list) => [...list, e.attachment]);
          this.edited.emit();
          this.notifier.info(`“${e.attachment.filename}” is attached.`);
        }
      },
      error: (error: unknown) => {
        this.uploadPercent.set(undefined);
        this.uploadError.set(uploadMessage(error));
      },
    });
  }

  protected removeAttachment(a: Attachment): void {
    confirm(this.dialog, {
      title: 'Remove this attachment?',
      message: `“${a.filename}” is removed from the activity.${endorsedDeleteNote(this.endorsedUnit())}`,
      confirm: 'Remove',
      cancel: 'Keep it',
      danger: true,
    }).subscribe((yes) => {
      if (yes) this.deleteAttachment(a);
    });
  }

  private deleteAttachment(a: Attachment): void {
    this.api.deleteAttachment(a.id).subscribe({
      next: () => {
        this.attachments.update((list) => list.filter((x) => x.id !== a.id));
        this.edited.emit();
      },
      error: (error: unknown) =>
        this.uploadError.set(error instanceof Error ? error.message : 'Not removed.'),
    });
  }
}
