import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  signal,
  untracked,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { moveItemInArray, type CdkDragDrop, DragDropModule } from '@angular/cdk/drag-drop';
import {
  NonNullableFormBuilder,
  ReactiveFormsModule,
  type AbstractControl,
  type ValidationErrors,
} from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import {
  OVERVIEW_MAX,
  distinctIds,
  markdownText,
  unitSchema,
  unitVisibilitySchema,
  type PersonRef,
  type Unit,
  type UnitLesson,
  type UnitOutcome,
  type UnitVisibility,
} from '../../../shared/schemas/units';
import { AppError } from '../errors/app-error';
import { ORDER_CONFLICTS, staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { apiResource } from '../http/resource';
import { formErrorMessage } from '../forms/server-errors';
import { zodValidator } from '../forms/validators';
import { clockTime, dayLabel } from '../lessons/clock';
import { confirm } from '../forms/confirm-dialog';
import { confirmEndorsedEdit, EndorsedNotice } from '../review/endorsed-edit';
import { OutcomePicker } from './outcome-picker';
import { UnitFields, unitFieldControls } from './unit-fields';
import {
  changedFields,
  describeChanges,
  draftOf,
  type UnitChange,
  type UnitDraft,
} from './unit-changes';
import { UnitsApi } from './units-api';
import type { HasUnsavedChanges } from '../forms/unsaved-changes';
import { plural } from '../../../shared/text/plural';
import { itemTitle } from '../a11y/item-title';

const outcomeIdsSchema = distinctIds(300, 'outcomes');

/** The outcome chips validated as `outcomeIds` of `unitUpdateSchema` (by their ids). */
function outcomesValidator(control: AbstractControl<UnitOutcome[]>): ValidationErrors | null {
  const result = outcomeIdsSchema.safeParse(control.value.map((o) => o.id));
  return result.success
    ? null
    : { invalid: result.error.issues[0]?.message ?? 'Check this field.' };
}

/** A 409: the unit as it is now, what changed, and what this person tried to do. */
interface Conflict {
  theirs: Unit;
  lines: string[];
  retry: { kind: 'edit'; change: UnitChange } | { kind: 'order'; lessonIds: string[] } | null;
}

/**
 * `/units/:id/edit`: the unit's fields (validated as the server's zod schema), overview with a
 * live sanitised preview, outcomes, visibility, co-authors, lessons in order, and delete.
 */
@Component({
  selector: 'app-unit-editor',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    DragDropModule,
    MarkdownComponent,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatRadioModule,
    MatSelectModule,
    FieldErrorPipe,
    OutcomePicker,
    UnitFields,
    EndorsedNotice,
  ],
  templateUrl: './unit-editor.html',
  styleUrl: './unit-editor.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitEditor implements HasUnsavedChanges {
  private readonly api = inject(UnitsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);

  /** Route parameter `:id`. */
  readonly id = input.required<string>();

  protected readonly overviewMax = OVERVIEW_MAX;
  private readonly read = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.get(id),
  });
  /**
   * The unit as last read or saved: the base every change is worked out against (a save's answer
   * replaces it without a new read).
   */
  protected readonly unit = linkedSignal<Unit | null>(() => this.read.value() ?? null);
  private readonly titled = itemTitle('Edit unit', () => this.unit()?.title);
  protected readonly loadError = this.read.error;
  protected readonly formError = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly conflict = signal<Conflict | null>(null);
  /** The lessons as shown (moved at once; put back if the server refuses the order). */
  protected readonly lessons = linkedSignal<UnitLesson[]>(() => this.unit()?.lessons ?? []);
  /** Names for the co-author list; without them only the current co-authors are offered. */
  private readonly teachersRead = apiResource({ load: () => this.api.teachers() });
  protected readonly teachers = computed<PersonRef[]>(() => this.teachersRead.value() ?? []);
  private readonly draft = signal<UnitDraft | null>(null);
  private leaving = false;

  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly fields = unitFieldControls();
  protected readonly form = this.fb.group({
    ...this.fields,
    overview: ['', zodValidator(markdownText(OVERVIEW_MAX))],
    visibility: ['private' as UnitVisibility, zodValidator(unitVisibilitySchema)],
    outcomes: this.fb.control<UnitOutcome[]>([], outcomesValidator),
    coauthorIds: this.fb.control<string[]>([], zodValidator(distinctIds(20, 'co-authors'))),
  });

  /** Only what the person changed against the loaded unit. */
  protected readonly changes = computed<UnitChange>(() => {
    const unit = this.unit();
    const draft = this.draft();
    return unit && draft ? changedFields(unit, draft) : {};
  });
  protected readonly dirty = computed(() => Object.keys(this.changes()).length > 0);
  /** The unit's title while it is endorsed: saving asks first, as it returns the unit to draft. */
  protected readonly endorsedTitle = computed(() => {
    const unit = this.unit();
    return unit?.status === 'endorsed' ? unit.title : null;
  });
  protected readonly overviewPreview = computed(() => this.draft()?.overview ?? '');
  /** Co-authors to choose from: the class teachers and those already chosen, never the owner. */
  protected readonly coauthorOptions = computed<PersonRef[]>(() => {
    const unit = this.unit();
    if (!unit) return [];
    const byId = new Map<string, PersonRef>();
    for (const p of [...unit.coauthors, ...this.teachers()]) byId.set(p.id, p);
    byId.delete(unit.owner.id);
    return [...byId.values()];
  });

  constructor() {
    this.form.valueChanges
      .pipe(takeUntilDestroyed(inject(DestroyRef)))
      .subscribe(() => this.draft.set(this.readDraft()));
    // A unit read (the first, or another id's) becomes the form's base.
    effect(() => {
      const loaded = this.read.value();
      if (loaded) untracked(() => this.show(loaded));
    });
  }

  hasUnsavedChanges(): boolean {
    return !this.leaving && this.dirty();
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    // The browser asks its own question; the text cannot be chosen (HTML Living Standard).
    if (this.hasUnsavedChanges()) event.preventDefault();
  }

  protected when(l: UnitLesson): string {
    return `${dayLabel(l.startsAt)}, ${clockTime(l.startsAt)}–${clockTime(l.endsAt)}`;
  }

  protected save(): void {
    const unit = this.unit();
    this.formError.set(null);
    if (!unit) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const change = this.changes();
    if (!Object.keys(change).length) return;
    confirmEndorsedEdit(this.dialog, this.endorsedTitle(), 'your changes').subscribe((yes) => {
      if (yes) this.send(unit.version, change);
    });
  }

  protected reload(): void {
    const conflict = this.conflict();
    if (conflict) this.show(conflict.theirs);
  }

  /** Sends this person's own change again on top of the unit as it is now. */
  protected reapply(): void {
    const conflict = this.conflict();
    if (!conflict?.retry) return;
    const title = conflict.theirs.status === 'endorsed' ? conflict.theirs.title : null;
    confirmEndorsedEdit(this.dialog, title, 'your change').subscribe((yes) => {
      if (yes) this.resend(conflict.theirs, conflict.retry!);
    });
  }

  private resend(theirs: Unit, retry: NonNullable<Conflict['retry']>): void {
    // The form becomes their unit plus only what this person changed, so nothing of theirs is
    // sent back (a field this person did not touch keeps the other person's value).
    this.rebase(theirs);
    if (retry.kind === 'edit') this.send(theirs.version, retry.change);
    else {
      const order = retry.lessonIds;
      this.lessons.set(order.map((id) => theirs.lessons.find((l) => l.id === id)!));
      this.sendOrder(theirs, order);
    }
  }

  protected dropped(event: CdkDragDrop<UnitLesson[]>): void {
    this.move(event.previousIndex, event.currentIndex);
  }

  protected move(from: number, to: number): void {
    const unit = this.unit();
    if (!unit || from === to || to < 0 || to >= this.lessons().length) return;
    const next = [...this.lessons()];
    moveItemInArray(next, from, to);
    this.lessons.set(next);
    confirmEndorsedEdit(this.dialog, this.endorsedTitle(), 'the new order').subscribe((yes) => {
      if (yes)
        this.sendOrder(
          unit,
          next.map((l) => l.id),
        );
      else this.lessons.set(unit.lessons);
    });
  }

  protected remove(): void {
    const unit = this.unit();
    if (!unit?.isOwner) return;
    confirm(this.dialog, {
      title: `Delete “${unit.title}”?`,
      message: `This deletes the unit and its ${plural(unit.lessons.length, 'lesson')} with their activities. It cannot be undone.`,
      confirm: 'Delete unit',
      cancel: 'Keep it',
      danger: true,
    }).subscribe((yes) => {
      if (!yes) return;
      this.api.remove(unit.id, unit.version).subscribe({
        next: () => {
          this.leaving = true;
          this.notifier.info(`“${unit.title}” is deleted.`);
          void this.router.navigate(['/units']);
        },
        error: (error: unknown) => this.failed(error, unit, null),
      });
    });
  }

  private send(version: number, change: UnitChange): void {
    const unit = this.unit()!;
    if (!Object.keys(change).length) return;
    this.saving.set(true);
    this.api.update(unit.id, { version, ...change }).subscribe({
      next: (saved) => {
        this.saving.set(false);
        this.show(saved);
        this.notifier.info('Your changes are saved.');
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.failed(error, unit, { kind: 'edit', change });
      },
    });
  }

  private sendOrder(unit: Unit, lessonIds: string[]): void {
    this.api.reorder(unit.id, { version: unit.version, lessonIds }).subscribe({
      // Only the order and version changed: the form keeps whatever is being edited.
      next: (saved) => this.unit.set(saved),
      error: (error: unknown) => {
        this.lessons.set(unit.lessons);
        this.failed(error, unit, { kind: 'order', lessonIds });
      },
    });
  }

  /** A 409 opens the conflict panel; a 400 goes under the fields; anything else above the form. */
  private failed(error: unknown, base: Unit, retry: Conflict['retry']): void {
    if (!(error instanceof AppError)) {
      this.notifier.errorNotShownYet(error);
      return;
    }
    const theirs = staleConflict(error, unitSchema, ORDER_CONFLICTS)?.current;
    if (theirs) {
      // A new order only fits when the lessons are still the same ones.
      const orderFits =
        retry?.kind !== 'order' ||
        (retry.lessonIds.length === theirs.lessons.length &&
          theirs.lessons.every((l) => retry.lessonIds.includes(l.id)));
      this.conflict.set({
        theirs,
        lines: describeChanges(base, theirs),
        retry: orderFits ? retry : null,
      });
      return;
    }
    const aliases = Object.fromEntries(
      error.details.filter((d) => d.path.startsWith('outcomeIds')).map((d) => [d.path, 'outcomes']),
    );
    this.formError.set(formErrorMessage(this.form, error, undefined, aliases));
  }

  /** Shows `unit` as the new base, with the form reset to it. */
  private show(unit: Unit): void {
    this.conflict.set(null);
    this.unit.set(unit);
    const draft = draftOf(unit);
    this.form.reset({ ...draft, outcomes: unit.outcomes, coauthorIds: [...draft.coauthorIds] });
    if (unit.isOwner) this.form.controls.coauthorIds.enable();
    else this.form.controls.coauthorIds.disable();
    this.draft.set(this.readDraft());
  }

  /** Takes `theirs` as the base and keeps this person's own unsaved changes in the form. */
  private rebase(theirs: Unit): void {
    const mine = this.changes();
    const values = this.form.getRawValue();
    this.show(theirs);
    const patch: Partial<typeof values> = {};
    for (const key of Object.keys(mine) as (keyof UnitChange)[]) {
      const name = key === 'outcomeIds' ? 'outcomes' : key;
      Object.assign(patch, { [name]: values[name] });
    }
    this.form.patchValue(patch);
  }

  private readDraft(): UnitDraft {
    const v = this.form.getRawValue();
    return { ...v, outcomeIds: v.outcomes.map((o) => o.id) };
  }
}
