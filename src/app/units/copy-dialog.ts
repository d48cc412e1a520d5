import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Router } from '@angular/router';
import { calendarDateSchema, unitCopySchema, type UnitCopy } from '../../../shared/schemas/reuse';
import type { Unit } from '../../../shared/schemas/units';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { ClassesApi } from '../classes/classes-api';
import { dayLabel } from '../lessons/clock';
import { ReuseApi, type CopiedUnit } from './reuse-api';

/** What the dialog copies: the unit's id, title and first lesson's date (null: no lessons). */
export interface CopyDialogData {
  unitId: string;
  title: string;
  firstLessonDate: string | null;
}

/** The dialog's data for a unit: its first lesson in time sets the date the form starts from. */
export function copyDialogData(unit: Unit): CopyDialogData {
  const dates = unit.lessons.map((l) => l.date).sort();
  return { unitId: unit.id, title: unit.title, firstLessonDate: dates[0] ?? null };
}

/**
 * "Copy to my units": asks for the copy's title, class and first lesson's date, copies, then
 * tells how the plans came out for the new class ("7 groups instead of 9; 2 shortfalls fewer")
 * and which lessons landed on a day without teaching, before opening the copy.
 */
@Component({
  selector: 'app-copy-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    @if (copied(); as copy) {
      <h2 mat-dialog-title>Copied to your units</h2>
      <mat-dialog-content>
        <p>
          <strong>{{ copy.title }}</strong> is yours: a private draft with {{ copy.lessons.length }}
          {{ copy.lessons.length === 1 ? 'lesson' : 'lessons' }}.
        </p>
        <p class="summary" role="status">Plans for your class: {{ copy.copySummary.text }}.</p>
        @if (flagged(copy).length) {
          <p>These lessons fall on a day without teaching; move them in the lesson editor:</p>
          <ul class="flags">
            @for (l of flagged(copy); track l.lessonId) {
              <li>{{ l.title }}: {{ day(l.startsAt) }}, {{ l.notTeaching }}</li>
            }
          </ul>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" (click)="close(copy)">Stay here</button>
        <button matButton="filled" type="button" (click)="open(copy)">Open the copy</button>
      </mat-dialog-actions>
    } @else {
      <h2 mat-dialog-title>Copy “{{ data.title }}” to my units</h2>
      <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
        <mat-dialog-content class="form-stack">
          <p class="muted">
            Every lesson, activity, parts list, outcome and file comes along. The copy is private
            until you share it, and keeps a link to this version of the original.
          </p>
          @if (formError(); as message) {
            <p class="form-error" role="alert">{{ message }}</p>
          }
          <mat-form-field appearance="outline">
            <mat-label>Title of the copy</mat-label>
            <input matInput formControlName="title" required />
            <mat-error>{{ form.controls.title.errors | fieldError }}</mat-error>
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Your class</mat-label>
            <mat-select formControlName="classId">
              <mat-option value="">Keep each lesson's class</mat-option>
              @for (c of classes.value() ?? []; track c.id) {
                <mat-option [value]="c.id">
                  {{ c.name }} ({{ c.studentCount }} students)
                </mat-option>
              }
            </mat-select>
            <mat-hint>The prep plans are worked out again for this class.</mat-hint>
            <mat-error>{{ form.controls.classId.errors | fieldError }}</mat-error>
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Date of the first lesson</mat-label>
            <input matInput type="date" formControlName="startDate" />
            <mat-hint>
              @if (data.firstLessonDate) {
                Now {{ day(data.firstLessonDate + 'T00:00') }}. Every lesson moves by the same
                number of days and keeps its time. Leave empty to keep the dates.
              } @else {
                The unit has no lessons yet.
              }
            </mat-hint>
            <mat-error>{{ form.controls.startDate.errors | fieldError }}</mat-error>
          </mat-form-field>
        </mat-dialog-content>
        @if (submitting()) {
          <mat-progress-bar mode="indeterminate" aria-label="Copying the unit" />
        }
        <mat-dialog-actions align="end">
          <button matButton type="button" mat-dialog-close>Cancel</button>
          <button matButton="filled" type="submit" [disabled]="submitting()">
            <mat-icon aria-hidden="true">content_copy</mat-icon>
            Copy
          </button>
        </mat-dialog-actions>
      </form>
    }
  `,
  styles: `
    .summary {
      font-weight: 600;
    }
    .flags {
      margin-top: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CopyDialog {
  private readonly api = inject(ReuseApi);
  private readonly classesApi = inject(ClassesApi);
  private readonly router = inject(Router);
  private readonly dialogRef = inject<MatDialogRef<CopyDialog, CopiedUnit>>(MatDialogRef);
  protected readonly data = inject<CopyDialogData>(MAT_DIALOG_DATA);

  protected readonly classes = apiResource({
    params: () => 'classes',
    load: () => this.classesApi.list(),
  });
  protected readonly form = new FormGroup({
    title: new FormControl(this.data.title, {
      nonNullable: true,
      validators: [zodValidator(unitCopySchema.shape.title.unwrap())],
    }),
    classId: new FormControl('', { nonNullable: true }),
    startDate: new FormControl(this.data.firstLessonDate ?? '', {
      nonNullable: true,
      validators: [(c) => (c.value === '' ? null : zodValidator(calendarDateSchema)(c))],
    }),
  });
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly copied = signal<CopiedUnit | null>(null);

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { title, classId, startDate } = this.form.getRawValue();
    const body: UnitCopy = { title };
    if (classId) body.classId = classId;
    // An unchanged date is no move: leave it out, so the copy keeps every date as it is.
    if (startDate && startDate !== this.data.firstLessonDate) body.startDate = startDate;
    this.submitting.set(true);
    this.api.copy(this.data.unitId, body).subscribe({
      next: (copy) => {
        this.submitting.set(false);
        this.copied.set(copy);
      },
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }

  protected flagged(copy: CopiedUnit) {
    return copy.copySummary.lessons.filter((l) => l.notTeaching !== null);
  }

  protected open(copy: CopiedUnit): void {
    this.dialogRef.close(copy);
    void this.router.navigate(['/units', copy.id]);
  }

  protected close(copy: CopiedUnit): void {
    this.dialogRef.close(copy);
  }

  protected day(value: string): string {
    return dayLabel(value);
  }
}
