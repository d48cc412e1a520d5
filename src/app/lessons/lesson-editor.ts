import { LiveAnnouncer } from '@angular/cdk/a11y';
import {
  CdkDrag,
  CdkDragHandle,
  CdkDropList,
  moveItemInArray,
  type CdkDragDrop,
} from '@angular/cdk/drag-drop';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  ElementRef,
  inject,
  input,
  linkedSignal,
  signal,
  untracked,
  viewChildren,
} from '@angular/core';
import { FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { MarkdownComponent } from 'ngx-markdown';
import { map } from 'rxjs';
import type { SchoolClass } from '../../../shared/schemas/classes';
import {
  TUB_STATUS_LABELS,
  type KitTypeSummary,
  type Part,
  type TubSummary,
} from '../../../shared/schemas/kits';
import {
  ACTIVITY_KIND_LABELS,
  lessonSchema,
  MAX_GROUP_SIZE,
  type Activity,
  type Lesson,
  type LessonUpdate,
} from '../../../shared/schemas/lessons';
import type { BellPeriod } from '../../../shared/schemas/school';
import { focusAfter } from '../a11y/focus-after';
import { AppError } from '../errors/app-error';
import { ORDER_CONFLICTS, staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { FieldErrorPipe } from '../forms/field-error';
import { formErrorMessage } from '../forms/server-errors';
import { apiResource, sameAnswer } from '../http/resource';
import { confirmEndorsedEdit, EndorsedNotice } from '../review/endorsed-edit';
import { UnitsApi } from '../units/units-api';
import { ActivityEditor } from './activity-editor';
import {
  changedFields,
  FIELD_LABELS,
  formValueOf,
  lessonBody,
  lessonControls,
  SERVER_PATHS,
} from './lesson-form';
import { chooseKitSwitch, type MissingPart } from './kit-switch-dialog';
import { LessonFormApi, type ReliefTeacher } from './lesson-form-api';
import type { HasUnsavedChanges } from '../forms/unsaved-changes';
import { plural } from '../../../shared/text/plural';
import { clockSpan } from '../../../shared/text/clock';
import { PluralPipe } from '../text/words';
import { itemTitle } from '../a11y/item-title';

/** A stale save: the lesson as it is now, and the change that was not saved. */
interface Conflict {
  current: Lesson;
  change: Omit<LessonUpdate, 'version'>;
  changedFields: string[];
}

/**
 * `/lessons/new?unit=<id>` and `/lessons/:id/edit`: the lesson's details, then (once it exists)
 * its activities in order with their materials and attachments.
 */
@Component({
  selector: 'app-lesson-editor',
  imports: [
    PluralPipe,
    ReactiveFormsModule,
    RouterLink,
    CdkDropList,
    CdkDrag,
    CdkDragHandle,
    MarkdownComponent,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    ActivityEditor,
    EndorsedNotice,
    FieldErrorPipe,
  ],
  templateUrl: './lesson-editor.html',
  styleUrl: './lesson-editor.scss',
  host: { '(window:beforeunload)': 'beforeUnload($event)' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LessonEditor implements HasUnsavedChanges {
  private readonly api = inject(LessonFormApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly dialog = inject(MatDialog);
  private readonly units = inject(UnitsApi);
  private readonly announcer = inject(LiveAnnouncer);
  private readonly focus = focusAfter();
  private readonly element = inject<ElementRef<HTMLElement>>(ElementRef).nativeElement;

  /** Route parameter `:id` (editing), absent when creating. */
  readonly id = input<string>();
  /** Query parameter `unit` (creating). */
  readonly unit = input<string>();

  protected readonly groupSizes = Array.from({ length: MAX_GROUP_SIZE }, (_, i) => i + 1);
  protected readonly kindLabels = ACTIVITY_KIND_LABELS;
  protected readonly tubStatus = TUB_STATUS_LABELS;
  protected readonly form = new FormGroup(lessonControls());
  protected readonly lesson = signal<Lesson | null>(null);
  private readonly titled = itemTitle('Edit lesson', () => this.lesson()?.title);
  /**
   * The lesson as stored, read again when an activity editor closes (a delete changes it). The
   * form's base is `lesson`, which a save's answer also replaces.
   */
  private readonly lessonRead = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.lesson(id),
  });
  protected readonly loadError = this.lessonRead.error;
  private readonly classesRead = apiResource({ load: () => this.api.classes() });
  protected readonly classes = computed<SchoolClass[]>(() => this.classesRead.value() ?? []);
  private readonly kitTypesRead = apiResource({ load: () => this.api.kitTypes() });
  protected readonly kitTypes = computed<KitTypeSummary[]>(() => this.kitTypesRead.value() ?? []);
  private readonly periodsRead = apiResource({ load: () => this.api.periods() });
  protected readonly periods = computed<BellPeriod[]>(() => this.periodsRead.value() ?? []);
  private readonly reliefRead = apiResource({ load: () => this.api.reliefTeachers() });
  protected readonly reliefTeachers = computed<ReliefTeacher[]>(
    () => this.reliefRead.value() ?? [],
  );
  /** The kit type whose parts and tubs are shown: the lesson's, or the one just chosen. */
  private readonly kitTypeId = signal<string | undefined>(undefined);
  /** A kit type chosen in the form: its tubs that are not retired are booked once they arrive. */
  private rebookFor: string | null = null;
  private readonly partsRead = apiResource({
    params: () => this.kitTypeId(),
    load: (id: string) => this.api.kitType(id).pipe(map((kit) => kit.parts)),
    // An open activity editor fills its form again when the parts change: not for the same list.
    equal: sameAnswer,
  });
  protected readonly parts = computed<readonly Part[]>(() => this.partsRead.value() ?? []);
  private readonly tubsRead = apiResource({
    params: () => this.kitTypeId(),
    load: (id: string) => this.api.tubs(id),
  });
  protected readonly tubs = computed<TubSummary[]>(() => this.tubsRead.value() ?? []);
  protected readonly activities = signal<Activity[]>([]);
  /** The activity open in its editor ('new' for one being added). */
  protected readonly editing = signal<string | null>(null);
  protected readonly formError = signal<string | null>(null);
  protected readonly orderMessage = signal<string | null>(null);
  protected readonly conflict = signal<Conflict | null>(null);
  protected readonly saving = signal(false);
  protected readonly creating = computed(() => !this.id());
  private readonly editors = viewChildren(ActivityEditor);
  /** The unit a new lesson goes in, read for its status (an edited lesson carries its unit). */
  private readonly newLessonUnit = apiResource({
    params: () => (this.id() ? undefined : this.unit()),
    load: (id: string) => this.units.get(id),
  });
  /** The unit's review status as last known; any saved change makes an endorsed one a draft. */
  private readonly unitStatus = linkedSignal(
    () => this.lesson()?.unit.status ?? this.newLessonUnit.value()?.status ?? null,
  );
  /** The unit's title while it is endorsed (the editors warn and ask before saving), else null. */
  protected readonly endorsedUnit = computed(() =>
    this.unitStatus() === 'endorsed'
      ? (this.lesson()?.unit.title ?? this.newLessonUnit.value()?.title ?? null)
      : null,
  );

  constructor() {
    effect(() => {
      const fresh = this.lessonRead.value();
      if (fresh) untracked(() => this.showRead(fresh));
    });
    effect(() => {
      const tubs = this.tubsRead.value();
      if (tubs) untracked(() => this.rebook(tubs));
    });
    const c = this.form.controls;
    c.kitTypeId.valueChanges.subscribe((kitTypeId) => this.showKit(kitTypeId, true));
    c.periodId.valueChanges.subscribe((periodId) => {
      const period = this.periods().find((p) => p.id === periodId);
      if (period) {
        c.startTime.setValue(period.startsAt, { emitEvent: false });
        c.endTime.setValue(period.endsAt);
      }
    });
    c.startTime.valueChanges.subscribe(() => {
      this.dropPeriodIfMoved();
      c.endTime.updateValueAndValidity();
    });
    c.date.valueChanges.subscribe(() => c.endTime.updateValueAndValidity());
    c.endTime.valueChanges.subscribe(() => this.dropPeriodIfMoved());
  }

  hasUnsavedChanges(): boolean {
    return this.form.dirty || this.editors().some((e) => e.isDirty());
  }

  protected beforeUnload(event: BeforeUnloadEvent): void {
    if (this.hasUnsavedChanges()) event.preventDefault();
  }

  /**
   * The lesson as read: the first read fills the form; a later one shows the stored activities
   * and unit status, and fills the form only when it holds no unsaved change.
   */
  private showRead(fresh: Lesson): void {
    this.activities.set(fresh.activities);
    this.unitStatus.set(fresh.unit.status);
    if (!this.lesson() || !this.form.dirty) this.fill(fresh);
  }

  private fill(lesson: Lesson): void {
    this.lesson.set(lesson);
    this.activities.set(lesson.activities);
    this.form.reset(formValueOf(lesson), { emitEvent: false });
    this.form.controls.endTime.updateValueAndValidity({ emitEvent: false });
    this.showKit(lesson.kitType.id, false);
  }

  /**
   * Shows the kit type's parts and tubs (the same one's read again, kept shown meanwhile); a kit
   * type chosen in the form (`rebook`) books its tubs that are not retired.
   */
  private showKit(kitTypeId: string | null, rebook: boolean): void {
    this.rebookFor = rebook ? kitTypeId : null;
    if (kitTypeId && kitTypeId === this.kitTypeId()) {
      this.partsRead.refresh();
      this.tubsRead.refresh();
    } else this.kitTypeId.set(kitTypeId ?? undefined);
  }

  /** Books the tubs of a kit type just chosen in the form, once they are read. */
  private rebook(tubs: TubSummary[]): void {
    if (this.rebookFor === null || this.rebookFor !== this.kitTypeId()) return;
    this.rebookFor = null;
    this.form.controls.tubIds.setValue(tubs.filter((t) => t.status !== 'retired').map((t) => t.id));
  }

  /** Times typed by hand that no longer match the chosen period leave the period. */
  private dropPeriodIfMoved(): void {
    const c = this.form.controls;
    const period = this.periods().find((p) => p.id === c.periodId.value);
    if (period && (period.startsAt !== c.startTime.value || period.endsAt !== c.endTime.value)) {
      c.periodId.setValue(null, { emitEvent: false });
    }
  }

  protected booked(tubId: string): boolean {
    return this.form.controls.tubIds.value.includes(tubId);
  }

  protected toggleTub(tubId: string, on: boolean): void {
    const ids = this.form.controls.tubIds.value.filter((id) => id !== tubId);
    this.form.controls.tubIds.setValue(on ? [...ids, tubId] : ids);
    this.form.controls.tubIds.markAsDirty();
  }

  protected tubLabel(tub: TubSummary): string {
    const notes = [this.tubStatus[tub.status]];
    if (tub.missingPieces) notes.push(`${plural(tub.missingPieces, 'piece')} missing`);
    return `${tub.label} (${notes.join(', ')})`;
  }

  protected periodLabel(p: BellPeriod): string {
    return `${p.name}, ${clockSpan(p.startsAt, p.endsAt)}`;
  }

  protected activitySummary(a: Activity): string {
    const things = plural(a.materials.length, 'material');
    return `${this.kindLabels[a.kind]} · ${a.minutes} min · ${things}`;
  }

  protected editLabel(a: Activity): string {
    return `Edit ${a.title}`;
  }

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.formError.set('Check the fields marked below.');
      this.focus(() => this.firstInvalid());
      return;
    }
    confirmEndorsedEdit(this.dialog, this.endorsedUnit(), 'this lesson').subscribe((yes) => {
      if (yes) this.send();
    });
  }

  private send(): void {
    const body = lessonBody(this.form.getRawValue());
    const lesson = this.lesson();
    if (!lesson) {
      const unitId = this.unit();
      if (!unitId) {
        this.formError.set('Open this page from a unit, so the lesson has a unit to go in.');
        return;
      }
      this.saving.set(true);
      this.api.create(unitId, body).subscribe({
        next: (created) => {
          this.form.markAsPristine();
          this.notifier.info(`“${created.title}” is created. Add its activities below.`);
          void this.router.navigate(['/lessons', created.id, 'edit']);
        },
        error: (error: unknown) => this.failed(error, {}),
      });
      return;
    }
    const change = changedFields(lesson, body);
    if (Object.keys(change).length === 0) {
      this.form.markAsPristine();
      this.notifier.info('Nothing has changed.');
      return;
    }
    if (change.kitTypeId) return this.switchKit(lesson.version, change, change.kitTypeId);
    this.save(lesson.version, change);
  }

  /**
   * A new kit type: the parts the activities use that it lacks are listed first, and the
   * teacher maps each to a part of it or leaves it out; the lesson switches in one save.
   */
  private switchKit(version: number, change: Omit<LessonUpdate, 'version'>, kitId: string): void {
    this.saving.set(true);
    this.api.kitType(kitId).subscribe({
      next: (kit) => {
        this.saving.set(false);
        const codes = new Set(kit.parts.map((p) => p.code));
        const missing = new Map<string, MissingPart>();
        for (const a of this.activities()) {
          for (const m of a.materials) {
            if (!m.partCode || codes.has(m.partCode)) continue;
            const entry = missing.get(m.partCode) ?? {
              code: m.partCode,
              name: m.partName,
              uses: [],
            };
            entry.uses.push(`${a.title} (${m.qty} per ${m.per})`);
            missing.set(m.partCode, entry);
          }
        }
        if (missing.size === 0) return this.save(version, change);
        chooseKitSwitch(this.dialog, {
          kitName: kit.name,
          missing: [...missing.values()],
          parts: kit.parts,
        }).subscribe((choice) => {
          if (choice) this.save(version, { ...change, ...choice });
        });
      },
      error: (error: unknown) => this.failed(error, change),
    });
  }

  private save(version: number, change: Omit<LessonUpdate, 'version'>): void {
    const lesson = this.lesson();
    if (!lesson) return;
    this.saving.set(true);
    this.api.update(lesson.id, { version, ...change }).subscribe({
      next: (saved) => {
        this.saving.set(false);
        this.conflict.set(null);
        this.fill(saved);
        this.notifier.info(`“${saved.title}” is saved.`);
        // The button was disabled while saving, which dropped focus to the page (SC 2.4.3).
        this.focus('.save-lesson');
      },
      error: (error: unknown) => this.failed(error, change),
    });
  }

  private failed(error: unknown, change: Omit<LessonUpdate, 'version'>): void {
    this.saving.set(false);
    this.focus(() => this.firstInvalid() ?? this.host('.save-lesson'));
    if (!(error instanceof AppError)) return this.notifier.errorNotShownYet(error);
    const lesson = this.lesson();
    const current = staleConflict(error, lessonSchema)?.current;
    if (current && lesson) {
      const differs = changedFields(lesson, lessonBody(formValueOf(current)));
      this.conflict.set({
        current,
        change,
        changedFields: Object.keys(differs).map((k) => FIELD_LABELS[k as keyof typeof differs]),
      });
      return;
    }
    this.formError.set(formErrorMessage(this.form, error, (e) => e.message, SERVER_PATHS));
  }

  /** After a 409: drop my changes and show the lesson as it is now. */
  protected reload(): void {
    const conflict = this.conflict();
    if (!conflict) return;
    this.conflict.set(null);
    this.fill(conflict.current);
  }

  /** After a 409: send my change again, on the version the server has now. */
  protected reapply(): void {
    const conflict = this.conflict();
    if (!conflict) return;
    this.lesson.set(conflict.current);
    this.save(conflict.current.version, conflict.change);
  }

  protected drop(event: CdkDragDrop<Activity[]>, byKeyboard = false): void {
    if (!this.lesson() || event.previousIndex === event.currentIndex) return;
    confirmEndorsedEdit(this.dialog, this.endorsedUnit(), 'the new order').subscribe((yes) => {
      if (yes) this.sendOrder(event.previousIndex, event.currentIndex);
      if (yes && byKeyboard)
        this.movedByKeyboard(event.currentIndex, event.currentIndex - event.previousIndex);
    });
  }

  private sendOrder(from: number, to: number): void {
    const lesson = this.lesson();
    if (!lesson) return;
    const before = this.activities();
    const next = [...before];
    moveItemInArray(next, from, to);
    this.activities.set(next);
    this.orderMessage.set(null);
    this.api
      .reorder(
        lesson.id,
        lesson.version,
        next.map((a) => a.id),
      )
      .subscribe({
        next: (saved) => {
          this.lesson.set(saved);
          this.activities.set(saved.activities);
        },
        error: (error: unknown) => {
          const current = staleConflict(error, lessonSchema, ORDER_CONFLICTS)?.current;
          if (current) {
            this.activities.set(current.activities);
            if (!this.form.dirty) this.fill(current);
            this.orderMessage.set(
              'Someone changed this lesson meanwhile, so the new order was not saved. The current order is shown; move the activity again.',
            );
          } else {
            this.activities.set(before);
            this.orderMessage.set(
              error instanceof Error ? error.message : 'The order was not saved.',
            );
          }
        },
      });
  }

  /** Moves an activity with the keyboard (drag-drop's alternative, WCAG 2.2 SC 2.5.7). */
  protected move(index: number, by: number): void {
    const to = index + by;
    if (to < 0 || to >= this.activities().length) return;
    this.drop({ previousIndex: index, currentIndex: to } as CdkDragDrop<Activity[]>, true);
  }

  /**
   * After a keyboard move focus stays on the moved item's arrow, or on its other arrow when this
   * one is now disabled (first or last, SC 2.4.3), and the new place is said (SC 4.1.3).
   */
  private movedByKeyboard(to: number, by: number): void {
    const list = this.activities();
    const activity = list[to];
    if (!activity) return;
    const edge = to === 0 || to === list.length - 1;
    const up = by < 0 !== edge;
    this.focus(`[data-activity="${activity.id}"] ${up ? '.move-up' : '.move-down'}`);
    void this.announcer.announce(`Moved to position ${to + 1} of ${list.length}.`);
  }

  /** Opens an activity's editor (or the new one's) with focus in its title (SC 2.4.3). */
  protected edit(id: string): void {
    this.editing.set(id);
    const where = id === 'new' ? 'app-activity-editor.new-activity' : `[data-activity="${id}"]`;
    this.focus(`${where} input[formcontrolname="title"]`);
  }

  private host(selector: string): HTMLElement | null {
    return this.element.querySelector<HTMLElement>(selector);
  }

  /** The first field shown as invalid, for focus after a refused save. */
  private firstInvalid(): HTMLElement | null {
    return this.host('form .mat-form-field-invalid :is(input, textarea, mat-select)');
  }

  /** An activity's change was saved: the server has returned an endorsed unit to draft. */
  protected unitEdited(): void {
    if (this.unitStatus() === 'endorsed') this.unitStatus.set('draft');
  }

  protected activitySaved(activity: Activity): void {
    const list = this.activities();
    const known = list.some((a) => a.id === activity.id);
    this.activities.set(
      known ? list.map((a) => (a.id === activity.id ? activity : a)) : [...list, activity],
    );
    const wasNew = this.editing() === 'new';
    this.editing.set(activity.id);
    // An added activity's editor moves into the list: focus follows it to its title (SC 2.4.3).
    if (wasNew) this.focus(`[data-activity="${activity.id}"] input[formcontrolname="title"]`);
  }

  /**
   * Focus returns to what opened the editor (SC 2.4.3): the activity's Edit button, or "Add an
   * activity" after adding was abandoned or the activity was deleted.
   */
  protected activityClosed(id: string | null, deleted: boolean): void {
    this.editing.set(null);
    this.focus(id && !deleted ? `[data-activity="${id}"] .edit-activity` : '.add-activity');
    const lesson = this.lesson();
    // A delete closes the editor too: the lesson is read again so it shows what is stored.
    if (lesson && id) this.lessonRead.refresh();
  }
}
