import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { PackAwayCreate } from '../../../shared/schemas/trays';
import type { AppError } from '../errors/app-error';
import type { TubPackAway } from './pack-away';
import { TrayBoardApi } from './tray-board-api';

/** What the dialog opens with: the lesson, its booked tubs pre-filled, and part names. */
export interface PackAwayData {
  lessonId: string;
  tubs: TubPackAway[];
  /** Part code → name, in parts-list order (the lost-parts box picks from these). */
  partNames: ReadonlyMap<string, string>;
}

type CountRow = FormGroup<{ partCode: FormControl<string>; count: FormControl<number> }>;
type FoundRow = FormGroup<{
  partCode: FormControl<string>;
  count: FormControl<number>;
  tubId: FormControl<string>;
}>;

const count = (n: number) =>
  new FormControl(n, {
    nonNullable: true,
    validators: [Validators.required, Validators.min(0), Validators.max(10_000)],
  });

/**
 * "Record pack-away": every booked tub's missing parts, pre-filled from the groups' counts and
 * the plan's return map, and the lost-parts box (parts that turned up and the tub each returns
 * to). Saving writes one audit per tub with the lesson's id, all or nothing.
 */
@Component({
  selector: 'app-pack-away-dialog',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
  ],
  templateUrl: './pack-away-dialog.html',
  styles: `
    .row {
      display: flex;
      flex-wrap: wrap;
      gap: 0 8px;
      align-items: baseline;
    }
    .count {
      width: 6rem;
    }
    h3 {
      margin: 12px 0 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PackAwayDialog {
  private readonly api = inject(TrayBoardApi);
  private readonly ref = inject(MatDialogRef<PackAwayDialog, boolean>);
  protected readonly data = inject<PackAwayData>(MAT_DIALOG_DATA);
  protected readonly parts = [...this.data.partNames].map(([code, name]) => ({ code, name }));
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected readonly form = new FormGroup({
    tubs: new FormArray(
      this.data.tubs.map(
        (t) =>
          new FormArray<CountRow>(
            t.missing.map(
              (m) =>
                new FormGroup({
                  partCode: new FormControl(m.partCode, { nonNullable: true }),
                  count: count(m.count),
                }),
            ),
          ),
      ),
    ),
    found: new FormArray<FoundRow>([]),
    note: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
  });

  protected name(code: string): string {
    return this.data.partNames.get(code) ?? code;
  }

  protected addFound(): void {
    this.form.controls.found.push(
      new FormGroup({
        partCode: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
        count: count(1),
        tubId: new FormControl(this.data.tubs[0]?.tubId ?? '', {
          nonNullable: true,
          validators: [Validators.required],
        }),
      }),
    );
  }

  protected removeFound(i: number): void {
    this.form.controls.found.removeAt(i);
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.saving()) return;
    const found = this.form.controls.found.getRawValue();
    const merge = (rows: { partCode: string; count: number }[]) => {
      const sums = new Map<string, number>();
      for (const r of rows)
        if (r.count > 0) sums.set(r.partCode, (sums.get(r.partCode) ?? 0) + r.count);
      return [...sums].map(([partCode, n]) => ({ partCode, count: n }));
    };
    const body: PackAwayCreate = {
      tubs: this.data.tubs.map((t, i) => ({
        tubId: t.tubId,
        missing: merge(this.form.controls.tubs.at(i).getRawValue()),
        found: merge(found.filter((f) => f.tubId === t.tubId)),
      })),
      note: this.form.controls.note.value,
    };
    this.saving.set(true);
    this.problem.set(null);
    this.api.packAway(this.data.lessonId, body).subscribe({
      next: () => this.ref.close(true),
      error: (err: AppError) => {
        this.saving.set(false);
        this.problem.set(err.message);
      },
    });
  }
}
