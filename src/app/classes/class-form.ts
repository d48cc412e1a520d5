import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import * as z from 'zod';
import {
  YEAR_LEVELS,
  classCreateSchema,
  yearLevelLabel,
  type SchoolClass,
} from '../../../shared/schemas/classes';
import { AppError } from '../errors/app-error';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { apiResource } from '../http/resource';
import { ClassesApi, type TeacherRef } from './classes-api';

/** A number input's value (a number, or '' / null while empty) checked with the schema's rule. */
function numberField(schema: z.ZodType, emptyMessage: string) {
  return zodValidator(
    z.preprocess((v) => (typeof v === 'string' ? Number(v) : v), schema),
    emptyMessage,
  );
}

const shape = classCreateSchema.shape;

/** Adds a class, or edits the one given as data; closes with the saved class. */
@Component({
  selector: 'app-class-form',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  template: `
    <h2 mat-dialog-title>{{ editing ? 'Edit ' + editing.name : 'Add a class' }}</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content class="form-stack">
        @if (formError(); as message) {
          <p class="form-error" role="alert">{{ message }}</p>
        }
        <mat-form-field appearance="outline">
          <mat-label>Class name</mat-label>
          <input matInput formControlName="name" required />
          <mat-hint>Like 4K</mat-hint>
          <mat-error>{{ form.controls.name.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Year level</mat-label>
          <mat-select formControlName="yearLevel" required>
            @for (level of yearLevels; track level) {
              <mat-option [value]="level">{{ label(level) }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ form.controls.yearLevel.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Number of students</mat-label>
          <input matInput type="number" min="1" max="60" formControlName="studentCount" required />
          <mat-error>{{ form.controls.studentCount.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Number of devices</mat-label>
          <input matInput type="number" min="0" max="200" formControlName="devices" required />
          <mat-hint>Tablets or laptops the class can use to program the controllers</mat-hint>
          <mat-error>{{ form.controls.devices.errors | fieldError }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Teachers</mat-label>
          <mat-select formControlName="teacherIds" multiple>
            @for (teacher of teachers(); track teacher.id) {
              <mat-option [value]="teacher.id">{{ teacher.name || teacher.email }}</mat-option>
            }
          </mat-select>
          <mat-hint>Who teaches this class; left empty, you are its teacher</mat-hint>
          <mat-error>{{ form.controls.teacherIds.errors | fieldError }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button matButton type="button" mat-dialog-close>Cancel</button>
        <button matButton="filled" type="submit" [disabled]="submitting()">
          {{ editing ? 'Save' : 'Add class' }}
        </button>
      </mat-dialog-actions>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClassForm {
  private readonly api = inject(ClassesApi);
  private readonly dialogRef = inject<MatDialogRef<ClassForm, SchoolClass>>(MatDialogRef);
  /** The class to edit, or null to add one. */
  protected readonly editing = inject<SchoolClass | null>(MAT_DIALOG_DATA, { optional: true });

  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly label = yearLevelLabel;
  protected readonly form = new FormGroup({
    name: new FormControl(this.editing?.name ?? '', {
      nonNullable: true,
      validators: [zodValidator(shape.name)],
    }),
    yearLevel: new FormControl<number | null>(this.editing?.yearLevel ?? null, {
      validators: [numberField(shape.yearLevel, 'Pick a year level.')],
    }),
    studentCount: new FormControl<number | null>(this.editing?.studentCount ?? null, {
      validators: [numberField(shape.studentCount, 'Enter the number of students.')],
    }),
    devices: new FormControl<number | null>(this.editing?.devices ?? null, {
      validators: [numberField(shape.devices, 'Enter the number of devices (0 if none).')],
    }),
    teacherIds: new FormControl<string[]>(this.editing?.teachers.map((t) => t.id) ?? [], {
      nonNullable: true,
    }),
  });
  /** Without the list the field stays empty; the server keeps the teachers as they are. */
  private readonly teachersRead = apiResource({ load: () => this.api.teachers() });
  protected readonly teachers = computed<TeacherRef[]>(() => this.teachersRead.value() ?? []);
  protected readonly submitting = signal(false);
  protected readonly formError = signal<string | null>(null);

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const body = {
      name: v.name.trim(),
      yearLevel: Number(v.yearLevel),
      studentCount: Number(v.studentCount),
      devices: Number(v.devices),
      ...(v.teacherIds.length || this.editing ? { teacherIds: v.teacherIds } : {}),
    };
    this.submitting.set(true);
    const request = this.editing ? this.api.update(this.editing.id, body) : this.api.create(body);
    request.subscribe({
      next: (saved) => this.dialogRef.close(saved),
      error: (error: unknown) => {
        this.submitting.set(false);
        if (!(error instanceof AppError)) throw error;
        this.formError.set(formErrorMessage(this.form, error));
      },
    });
  }
}
