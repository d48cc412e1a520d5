import { ScrollRegion } from '../a11y/scroll-region';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  untracked,
  input,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import * as z from 'zod';
import {
  MAX_PART_QTY,
  PART_CATEGORIES,
  partCategorySchema,
  type Part,
  type PartCategory,
} from '../../../shared/schemas/kits';
import { FieldErrorPipe } from '../forms/field-error';
import { zodValidator } from '../forms/validators';
import type { NewPart, PartChange } from './kits-api';
import { PartPhoto } from './part-photo';

/** The id of the row being added (never a real part's id, which is a UUID). */
export const NEW_PART_ID = 'new-part';

/** A request to save one edited row. */
export interface PartSave {
  part: Part;
  change: PartChange;
}

const wholeIn = (min: number, max: number) =>
  z.coerce.number().refine((v) => Number.isInteger(v) && v >= min && v <= max, {
    error: `Use a whole number from ${min} to ${max}.`,
  });

/**
 * A kit type's parts list: sort, filter and pages, and (for those who may edit) one row at a
 * time edited in place. Saving is the page's job (`save`), which knows the kit type's version.
 */
@Component({
  selector: 'app-parts-table',
  imports: [
    ScrollRegion,
    ReactiveFormsModule,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatButtonModule,
    MatIconModule,
    FieldErrorPipe,
    PartPhoto,
  ],
  templateUrl: './parts-table.html',
  styleUrl: './parts-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PartsTable {
  readonly parts = input.required<readonly Part[]>();
  readonly canEdit = input(false);
  /** Whether a save is on its way (the row's controls wait). */
  readonly saving = input(false);
  readonly save = output<PartSave>();
  /** A part added by hand (the page sends it with the kit type's version). */
  readonly add = output<NewPart>();
  /** A part to remove (the page asks first). */
  readonly remove = output<Part>();
  /** The kit type whose parts these are (for the photo addresses). */
  readonly kitTypeId = input('');
  /** A part's photo was uploaded or removed (photos do not change the kit type's version). */
  readonly photoChanged = output<Part>();

  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  protected readonly categories = PART_CATEGORIES;
  protected readonly filter = signal('');
  protected readonly editingId = signal<string | null>(null);
  protected readonly newId = NEW_PART_ID;
  /** The row being added, shown first while its fields are filled in. */
  private readonly draft = signal<Part | null>(null);
  protected readonly columns = computed(() => [
    'photo',
    'code',
    'name',
    'colour',
    'category',
    'qty',
    'compartment',
    'small',
    'chargeMinutes',
    ...(this.canEdit() ? ['actions'] : []),
  ]);
  protected readonly dataSource = new MatTableDataSource<Part>([]);
  protected readonly form = new FormGroup({
    code: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(z.string().trim().min(1).max(64), 'Enter a part code.')],
    }),
    name: new FormControl('', {
      nonNullable: true,
      validators: [zodValidator(z.string().trim().min(1).max(200), 'Enter a part name.')],
    }),
    colour: new FormControl('', { nonNullable: true }),
    category: new FormControl<PartCategory>('other', {
      nonNullable: true,
      validators: [zodValidator(partCategorySchema)],
    }),
    qty: new FormControl<number | null>(0, {
      validators: [zodValidator(wholeIn(0, MAX_PART_QTY), 'Enter how many one tub holds.')],
    }),
    compartment: new FormControl('', { nonNullable: true }),
    small: new FormControl(false, { nonNullable: true }),
    chargeMinutes: new FormControl<number | null>(null, {
      validators: [
        (c) => (c.value === null || c.value === '' ? null : zodValidator(wholeIn(1, 1440))(c)),
      ],
    }),
  });

  constructor() {
    this.dataSource.sortingDataAccessor = (part, column) => sortKey(part, column);
    this.dataSource.filterPredicate = (part, text) => matches(part, text);
    effect(() => {
      this.dataSource.sort = this.sort();
      this.dataSource.paginator = this.paginator();
    });
    effect(() => {
      const draft = this.draft();
      this.dataSource.data = draft ? [draft, ...this.parts()] : [...this.parts()];
      // A new list (after a save or reload) ends the edit of a row it no longer matches.
      const id = untracked(() => this.editingId());
      if (id && id !== NEW_PART_ID && !this.parts().some((p) => p.id === id))
        this.editingId.set(null);
    });
    effect(() => (this.dataSource.filter = this.filter().trim().toLowerCase()));
  }

  protected edit(part: Part): void {
    this.form.reset({
      code: part.code,
      name: part.name,
      colour: part.colour ?? '',
      category: part.category,
      qty: part.qty,
      compartment: part.compartment ?? '',
      small: part.small,
      chargeMinutes: part.chargeMinutes,
    });
    this.editingId.set(part.id);
  }

  /**
   * Opens an empty row at the top of the list for a new part (or the row the person filled in,
   * `values`, again after the server refused it, e.g. a code already taken).
   */
  startAdding(values?: NewPart): void {
    const part: Part = {
      id: NEW_PART_ID,
      code: '',
      name: '',
      colour: null,
      category: 'other',
      qty: 1,
      compartment: null,
      small: false,
      chargeMinutes: null,
      ...values,
      hasPhoto: false,
    };
    // The filter and the page would hide the new row: show it first, on the first page.
    this.filter.set('');
    this.paginator().firstPage();
    this.draft.set(part);
    this.edit(part);
  }

  protected cancel(): void {
    this.editingId.set(null);
    this.draft.set(null);
  }

  /** Ends the edit; the page saves and gives a fresh list. */
  protected submit(part: Part): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const next: NewPart = {
      code: v.code.trim(),
      name: v.name.trim(),
      colour: v.colour.trim() || null,
      category: v.category,
      qty: Number(v.qty),
      compartment: v.compartment.trim() || null,
      small: v.small,
      chargeMinutes:
        v.chargeMinutes === null || (v.chargeMinutes as unknown) === ''
          ? null
          : Number(v.chargeMinutes),
    };
    if (part.id === NEW_PART_ID) {
      this.cancel();
      this.add.emit(next);
      return;
    }
    // Only what changed is sent, so a colleague's edit of another field is not overwritten.
    const change: PartChange = {};
    for (const key of Object.keys(next) as (keyof PartChange)[]) {
      if (next[key] !== part[key]) (change as Record<string, unknown>)[key] = next[key];
    }
    this.editingId.set(null);
    if (Object.keys(change).length > 0) this.save.emit({ part, change });
  }

  protected setFilter(value: string): void {
    this.filter.set(value);
  }
}

function sortKey(part: Part, column: string): string | number {
  switch (column) {
    case 'qty':
      return part.qty;
    case 'chargeMinutes':
      return part.chargeMinutes ?? -1;
    case 'small':
      return part.small ? 1 : 0;
    default: {
      const value = part[column as keyof Part];
      return typeof value === 'string' ? value.toLocaleLowerCase() : '';
    }
  }
}

/** Whether the filter text occurs in the code, name, colour, category or compartment. */
function matches(part: Part, text: string): boolean {
  return [part.code, part.name, part.colour ?? '', part.category, part.compartment ?? '']
    .join(' ')
    .toLowerCase()
    .includes(text);
}
