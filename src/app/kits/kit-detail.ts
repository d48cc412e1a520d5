import { ScrollRegion } from '../a11y/scroll-region';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { catchError, map, of, tap } from 'rxjs';
import {
  TUB_STATUS_LABELS,
  kitTypeSchema,
  type KitType,
  type Part,
  type Tub,
  type TubSummary,
} from '../../../shared/schemas/kits';
import { Session } from '../auth/session';
import { AppError } from '../errors/app-error';
import { staleConflict } from '../errors/conflict';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { confirmDelete } from './delete-dialog';
import { ImportDialog, type ImportDialogData } from './import-dialog';
import { KIT_EDITORS } from './kit-list';
import { KitTypeEditDialog } from './kit-type-edit-dialog';
import { KitsApi, type Conflicts, type NewPart, type ReplacementLine } from './kits-api';
import { dayAfter, termThatMatters } from './term-range';
import { PartsTable, type PartSave } from './parts-table';

/** An edit refused as stale: what it was, in words, and how to send it again. */
interface StaleEdit {
  what: string;
  retry: (version: number) => void;
}
import { TubDialog, type TubDialogData } from './tub-dialog';
import { TubFormDialog, type TubFormData } from './tub-form-dialog';
import { PluralPipe } from '../text/words';
import { itemTitle } from '../a11y/item-title';

const DIALOG_WIDTH = 'min(32rem, calc(100vw - 2rem))';

/**
 * Term 3 of 2026 in the demo calendar, both days included: used when the school has no term now
 * or ahead.
 */
export const DEFAULT_RANGE = { from: '2026-07-20', to: '2026-09-25' };

/** The dates the booking conflicts are read for. */
interface DateRange {
  from: string;
  to: string;
}

/** `/kits/:id`: a kit type's parts list, its tubs, the replacement list and booking conflicts. */
@Component({
  selector: 'app-kit-detail',
  imports: [
    ScrollRegion,
    PluralPipe,
    RouterLink,
    ReactiveFormsModule,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    MatTableModule,
    PartsTable,
  ],
  templateUrl: './kit-detail.html',
  styleUrl: './kit-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitDetail {
  /** The route's `:id` (component input binding). */
  readonly id = input.required<string>();

  private readonly api = inject(KitsApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  protected readonly tubColumns = ['label', 'controllerLabel', 'status', 'missing', 'open'];
  protected readonly replacementColumns = ['partCode', 'name', 'missing', 'tubs'];
  /** The kit type with its parts list, as read or as the last save answered. */
  private readonly kitRead = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.get(id),
  });
  protected readonly kit = computed(() => this.kitRead.value() ?? null);
  private readonly titled = itemTitle('Kit type', () => this.kit()?.name);
  protected readonly loading = this.kitRead.loading;
  protected readonly saving = signal(false);
  private readonly tubsRead = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.tubs(id),
  });
  protected readonly tubs = computed(() => this.tubsRead.value() ?? []);
  private readonly replacementsRead = apiResource({
    params: () => this.id(),
    load: (id: string) => this.api.replacements(id),
  });
  protected readonly replacements = computed(() => this.replacementsRead.value() ?? []);
  /**
   * The school's current term, else the next one (null when there is neither, or the terms did
   * not load).
   */
  private readonly termRead = apiResource({
    load: () =>
      this.api.terms().pipe(
        map((terms): DateRange | null => {
          const today = new Date().toISOString().slice(0, 10);
          const term = termThatMatters(terms, today);
          return term ? { from: term.startsOn, to: term.endsOn } : null;
        }),
        catchError(() => of(null)),
      ),
  });
  /** The range asked for: a new object on each "Show", so the same dates are read again. */
  private readonly conflictRange = signal<DateRange | undefined>(undefined);
  private readonly conflictsRead = apiResource({
    params: () => this.conflictRange(),
    // The view's To day is included; the API's `to` is exclusive.
    load: ({ from, to }: DateRange) => this.api.conflicts(from, dayAfter(to)),
  });
  protected readonly conflicts = computed<Conflicts | null>(
    () => this.conflictsRead.value() ?? null,
  );
  /** An edit the server refused as stale, kept so it can be re-applied on the new version. */
  protected readonly stale = signal<StaleEdit | null>(null);
  private readonly partsTable = viewChild(PartsTable);
  protected readonly canEdit = computed(() =>
    KIT_EDITORS.includes(this.session.user()?.role ?? ''),
  );
  protected readonly range = new FormGroup({
    from: new FormControl(DEFAULT_RANGE.from, { nonNullable: true }),
    to: new FormControl(DEFAULT_RANGE.to, { nonNullable: true }),
  });

  constructor() {
    // The conflicts open on the school's current or next term when there is one, else term 3.
    effect(() => {
      const term = this.termRead.value();
      if (term === undefined) return;
      untracked(() => {
        if (term) this.range.setValue(term);
        this.loadConflicts();
      });
    });
  }

  protected csvUrl(kit: KitType): string {
    return this.api.partsCsvUrl(kit.id);
  }

  protected replacementsCsvUrl(kit: KitType): string {
    return this.api.replacementsCsvUrl(kit.id);
  }

  protected tubsText(line: ReplacementLine): string {
    return line.tubs.map((t) => `${t.label} (${t.count})`).join(', ');
  }

  /** The status in words ("Needs sorting"), never the code. */
  protected statusLabel(tub: TubSummary): string {
    return TUB_STATUS_LABELS[tub.status];
  }

  protected missingText(tub: TubSummary): string {
    if (tub.missing.length === 0) return 'Nothing missing';
    return tub.missing.map((m) => `${m.count} × ${m.partName} (${m.partCode})`).join(', ');
  }

  /** Reloads everything from the server and drops a refused edit. */
  reload(): void {
    this.stale.set(null);
    this.load();
  }

  protected savePart(request: PartSave): void {
    const kit = this.kit();
    if (!kit) return;
    this.send(request, kit.version);
  }

  /** Adds a part typed in the table; a taken code reopens the row with what was typed. */
  protected addPart(part: NewPart): void {
    const kit = this.kit();
    if (!kit) return;
    this.sendAdd(part, kit.version);
  }

  /** Removes a part after asking; the server refuses (409) while activities list it. */
  protected removePart(part: Part): void {
    const kit = this.kit();
    if (!kit) return;
    confirmDelete(this.dialog, {
      title: `Remove ${part.code} ${part.name}?`,
      message:
        `This removes ${part.code} from the parts list of ${kit.name}, with its photo and the ` +
        'tubs’ missing counts of it.',
      confirm: `Remove ${part.code}`,
      run: () =>
        this.api.removePart(kit.id, part.id, kit.version).pipe(tap((k) => this.kitRead.set(k))),
    }).subscribe((gone) => {
      if (gone) {
        this.notifier.info(`${part.code} is removed.`);
        this.tubsRead.reload();
        this.replacementsRead.reload();
      } else {
        // A refusal may come from a newer list (stale version): show the list as saved now.
        this.kitRead.reload();
      }
    });
  }

  /** Sends the refused edit again on the version the server holds now. */
  protected reapply(): void {
    const edit = this.stale();
    const kit = this.kit();
    if (!edit || !kit) return;
    this.stale.set(null);
    edit.retry(kit.version);
  }

  protected importCsv(kit: KitType): void {
    const data: ImportDialogData = { kitTypeId: kit.id, kitTypeName: kit.name };
    this.dialog
      .open(ImportDialog, { data, width: 'min(44rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((imported?: number) => {
        if (imported === undefined) return;
        this.notifier.info(`Imported ${imported} ${imported === 1 ? 'part' : 'parts'}.`);
        this.reload();
      });
  }

  protected openTub(tub: TubSummary): void {
    const parts = this.kit()?.parts ?? [];
    const data: TubDialogData = { tubId: tub.id, parts, canAudit: this.canAudit() };
    this.dialog
      .open(TubDialog, { data, width: 'min(48rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((changed?: boolean) => {
        if (changed) this.reload();
      });
  }

  protected editKit(kit: KitType): void {
    this.dialog
      .open(KitTypeEditDialog, { data: kit, width: DIALOG_WIDTH })
      .afterClosed()
      .subscribe((saved?: KitType) => {
        if (!saved) return;
        this.kitRead.set(saved);
        this.notifier.info(`${saved.name} is saved.`);
      });
  }

  /** Deletes the kit type after asking; the server refuses (409) while lessons use it. */
  protected deleteKit(kit: KitType): void {
    confirmDelete(this.dialog, {
      title: `Delete ${kit.name}?`,
      message:
        `This deletes ${kit.name} with its parts list, part photos and ${kit.tubCount} ` +
        `${kit.tubCount === 1 ? 'tub' : 'tubs'}. It cannot be undone.`,
      confirm: 'Delete kit type',
      run: () => this.api.delete(kit.id),
    }).subscribe((gone) => {
      if (!gone) return;
      this.notifier.info(`${kit.name} is deleted.`);
      void this.router.navigate(['/kits']);
    });
  }

  protected addTub(kit: KitType): void {
    this.openTubForm({ kitTypeId: kit.id });
  }

  protected editTub(tub: TubSummary): void {
    this.openTubForm({ kitTypeId: tub.kitTypeId, tub });
  }

  /** Deletes a tub after asking; the server refuses (409) while lessons book it. */
  protected deleteTub(tub: TubSummary): void {
    confirmDelete(this.dialog, {
      title: `Delete ${tub.label}?`,
      message: `This deletes ${tub.label} with its missing parts and audit history. It cannot be undone.`,
      confirm: `Delete ${tub.label}`,
      run: () => this.api.deleteTub(tub.id),
    }).subscribe((gone) => {
      if (!gone) return;
      this.notifier.info(`${tub.label} is deleted.`);
      this.load();
    });
  }

  /** A photo does not change the kit type's version, so only that part's flag is updated. */
  protected photoChanged(part: Part): void {
    const kit = this.kit();
    if (!kit) return;
    this.kitRead.set({
      ...kit,
      parts: kit.parts.map((p) => (p.code === part.code ? { ...p, hasPhoto: part.hasPhoto } : p)),
    });
  }

  protected loadConflicts(): void {
    const { from, to } = this.range.getRawValue();
    if (!/^\d{4}-\d{2}-\d{2}$/.test(from) || !/^\d{4}-\d{2}-\d{2}$/.test(to)) return;
    this.conflictRange.set({ from, to });
  }

  /** Relief teachers record audits too; leads only read. */
  private canAudit(): boolean {
    return ['admin', 'teacher', 'relief'].includes(this.session.user()?.role ?? '');
  }

  private openTubForm(data: TubFormData): void {
    this.dialog
      .open(TubFormDialog, { data, width: DIALOG_WIDTH })
      .afterClosed()
      .subscribe((saved?: Tub) => {
        if (!saved) return;
        this.notifier.info(`${saved.label} is saved.`);
        // The kit type's tub count and the replacement list follow the tubs.
        this.load();
      });
  }

  private send(request: PartSave, version: number): void {
    const id = this.id();
    this.saving.set(true);
    this.api.updatePart(id, request.part.id, version, request.change).subscribe({
      next: (kit) => {
        this.saving.set(false);
        this.kitRead.set(kit);
        this.notifier.info(`${request.part.code} is saved.`);
        // A tub's stock follows the parts list's quantities.
        this.tubsRead.reload();
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const conflict = staleConflict(error, kitTypeSchema);
        if (conflict) {
          // Show the list as it is now; the person chooses to re-apply or leave it.
          if (conflict.current) this.kitRead.set(conflict.current);
          else this.load();
          this.stale.set({
            what: `your change to ${request.part.code}`,
            retry: (v) => this.send(request, v),
          });
        } else if (error instanceof AppError) {
          this.notifier.error(error.message);
        }
      },
    });
  }

  private sendAdd(part: NewPart, version: number): void {
    const id = this.id();
    this.saving.set(true);
    this.api.addPart(id, version, part).subscribe({
      next: (kit) => {
        this.saving.set(false);
        this.kitRead.set(kit);
        this.notifier.info(`${part.code} is added.`);
        this.tubsRead.reload();
      },
      error: (error: unknown) => {
        this.saving.set(false);
        const conflict = staleConflict(error, kitTypeSchema);
        if (conflict) {
          if (conflict.current) this.kitRead.set(conflict.current);
          else this.load();
          this.stale.set({
            what: `your new part ${part.code}`,
            retry: (v) => this.sendAdd(part, v),
          });
          return;
        }
        if (error instanceof AppError) {
          this.notifier.error(error.message);
          // What was typed comes back, to correct (e.g. a code another part has).
          this.partsTable()?.startAdding(part);
        }
      },
    });
  }

  /** Reads the kit type, its tubs and its replacement list again. */
  private load(): void {
    this.kitRead.reload();
    this.tubsRead.reload();
    this.replacementsRead.reload();
  }
}
