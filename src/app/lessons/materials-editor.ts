import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import {
  FormArray,
  FormControl,
  FormGroup,
  ReactiveFormsModule,
  type AbstractControl,
  type ValidationErrors,
} from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { Part } from '../../../shared/schemas/kits';
import {
  MATERIAL_PER,
  materialPerSchema,
  type Material,
  type MaterialInput,
  type MaterialPer,
} from '../../../shared/schemas/lessons';
import { requiredText, wholeNumber } from '../../../shared/schemas/units';
import { FieldErrorPipe } from '../forms/field-error';
import { zodValidator } from '../forms/validators';

/** Whether a line is a part of the kit type or a consumable (card, tape, batteries…). */
export type MaterialSource = 'part' | 'consumable';

/** One line of the bill of materials; `part` holds the typed text until a part is picked. */
export type MaterialRowForm = FormGroup<{
  source: FormControl<MaterialSource>;
  part: FormControl<Part | string | null>;
  consumable: FormControl<string>;
  qty: FormControl<number | null>;
  per: FormControl<MaterialPer>;
  returnable: FormControl<boolean>;
}>;

export const PER_LABELS: Record<MaterialPer, string> = {
  group: 'per group',
  student: 'per student',
  class: 'per class',
};

export const PICK_PART_MESSAGE = 'Pick a part from the kit’s parts list.';
const consumableText = requiredText('what the consumable is', 200);
const qtyNumber = wholeNumber(0, 10_000, 'Use a whole number from 0 to 10000.');

function sourceOf(control: AbstractControl): MaterialSource | undefined {
  return control.parent?.get('source')?.value as MaterialSource | undefined;
}

/** A part line needs a part picked from the list, not just typed text. */
function pickedPart(control: AbstractControl): ValidationErrors | null {
  if (sourceOf(control) !== 'part') return null;
  const value: unknown = control.value;
  return value && typeof value === 'object' ? null : { pick: PICK_PART_MESSAGE };
}

function consumableName(control: AbstractControl): ValidationErrors | null {
  if (sourceOf(control) !== 'consumable') return null;
  return zodValidator(consumableText)(control);
}

/**
 * A form line for a stored material (or an empty one of `source`). A stored part code that the
 * parts list no longer has stays as text, so the line asks for a part to be picked again.
 */
export function materialRow(
  parts: readonly Part[],
  from: Material | MaterialSource = 'part',
): MaterialRowForm {
  const stored = typeof from === 'string' ? null : from;
  const source: MaterialSource = stored
    ? stored.partCode !== null
      ? 'part'
      : 'consumable'
    : (from as MaterialSource);
  const part = stored?.partCode
    ? (parts.find((p) => p.code === stored.partCode) ?? stored.partCode)
    : null;
  const row: MaterialRowForm = new FormGroup({
    source: new FormControl<MaterialSource>(source, { nonNullable: true }),
    part: new FormControl<Part | string | null>(part, { validators: [pickedPart] }),
    consumable: new FormControl(stored?.consumable ?? '', {
      nonNullable: true,
      validators: [consumableName],
    }),
    qty: new FormControl<number | null>(stored?.qty ?? 1, {
      validators: [zodValidator(qtyNumber, 'Enter a quantity.')],
    }),
    per: new FormControl<MaterialPer>(stored?.per ?? 'group', {
      nonNullable: true,
      validators: [zodValidator(materialPerSchema)],
    }),
    returnable: new FormControl(stored?.returnable ?? source === 'part', { nonNullable: true }),
  });
  row.controls.source.valueChanges.subscribe((next) => {
    row.controls.part.updateValueAndValidity();
    row.controls.consumable.updateValueAndValidity();
    // Parts come back to the tub at pack-away; consumables are used up, unless changed by hand.
    if (!row.controls.returnable.dirty) row.controls.returnable.setValue(next === 'part');
  });
  // The validators read `source` from the parent, which exists only now.
  row.controls.part.updateValueAndValidity();
  row.controls.consumable.updateValueAndValidity();
  return row;
}

/** The lines as the API takes them (`materials` of an activity, replaced whole). */
export function materialsFromForm(rows: FormArray<MaterialRowForm>): MaterialInput[] {
  return rows.controls.map((row) => {
    const v = row.getRawValue();
    const common = { qty: v.qty ?? 0, per: v.per, returnable: v.returnable };
    if (v.source === 'part') {
      const code = v.part && typeof v.part === 'object' ? v.part.code : String(v.part ?? '');
      return { partCode: code, ...common };
    }
    return { consumable: v.consumable.trim(), ...common };
  });
}

/** The label of a part in the field and the list: its code and name. */
export function partLabel(value: Part | string | null): string {
  if (!value) return '';
  return typeof value === 'string' ? value : `${value.code} · ${value.name}`;
}

/**
 * The bill of materials of an activity: lines of a kit part (found by code or name with an
 * autocomplete) or a consumable, each with a quantity, per group/student/class, and whether it
 * is returned at pack-away. The parent owns the FormArray and saves it.
 */
@Component({
  selector: 'app-materials-editor',
  imports: [
    ReactiveFormsModule,
    MatAutocompleteModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    FieldErrorPipe,
  ],
  templateUrl: './materials-editor.html',
  styleUrl: './materials-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MaterialsEditor {
  /** The lines, owned by the activity form. */
  readonly rows = input.required<FormArray<MaterialRowForm>>();
  /** The kit type's parts list. */
  readonly parts = input.required<readonly Part[]>();

  protected readonly perValues = MATERIAL_PER;
  protected readonly perLabels = PER_LABELS;
  protected readonly display = partLabel;

  protected add(source: MaterialSource): void {
    this.rows().push(materialRow(this.parts(), source));
    this.rows().markAsDirty();
  }

  protected remove(index: number): void {
    this.rows().removeAt(index);
    this.rows().markAsDirty();
  }

  /** Parts whose code or name contains what was typed (all of them before anything is typed). */
  protected options(row: MaterialRowForm): readonly Part[] {
    const value = row.controls.part.value;
    const text = (typeof value === 'string' ? value : '').trim().toLowerCase();
    if (!text) return this.parts();
    return this.parts().filter(
      (p) => p.code.toLowerCase().includes(text) || p.name.toLowerCase().includes(text),
    );
  }

  protected lineLabel(index: number): string {
    return `line ${index + 1}`;
  }
}
