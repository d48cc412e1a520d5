import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  signal,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import {
  Subject,
  catchError,
  debounceTime,
  distinctUntilChanged,
  map,
  merge,
  of,
  switchMap,
  tap,
} from 'rxjs';
import {
  OUTCOME_PAGE_MAX,
  type Framework,
  type Outcome,
  type OutcomeImportResult,
} from '../../../shared/schemas/outcomes';
import { Session } from '../auth/session';
import { Notifier } from '../errors/notifier';
import { FrameworkDialog } from './framework-dialog';
import { OutcomeImportDialog, type OutcomeImportData } from './import-dialog';
import { OutcomesApi, type OutcomeSearch } from './outcomes-api';

/** How long typing pauses before the search runs. */
const TYPING_PAUSE_MS = 300;

/** `/outcomes`: browse and search a framework's outcomes; admins and leads create and import. */
@Component({
  selector: 'app-outcomes',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
  ],
  templateUrl: './outcomes.html',
  styleUrl: './outcomes.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutcomesPage {
  private readonly api = inject(OutcomesApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly session = inject(Session);

  protected readonly columns = ['code', 'description', 'strand', 'yearBand'];
  protected readonly pageMax = OUTCOME_PAGE_MAX;
  protected readonly frameworks = signal<readonly Framework[]>([]);
  protected readonly frameworksLoaded = signal(false);
  protected readonly frameworkId = signal('');
  protected readonly framework = computed(
    () => this.frameworks().find((f) => f.id === this.frameworkId()) ?? null,
  );
  protected readonly outcomes = signal<readonly Outcome[]>([]);
  protected readonly truncated = signal(false);
  protected readonly searching = signal(false);
  protected readonly searchFailed = signal(false);
  /** Admins and leads may create frameworks and import (the server's `outcomes.edit`). */
  protected readonly canEdit = computed(() =>
    ['admin', 'lead'].includes(this.session.user()?.role ?? ''),
  );

  protected readonly q = new FormControl('', { nonNullable: true });
  protected readonly yearBand = new FormControl('', { nonNullable: true });
  /** Runs the search now (a framework or year band picked, Enter pressed, an import done). */
  private readonly now$ = new Subject<void>();

  constructor() {
    const typed$ = this.q.valueChanges.pipe(debounceTime(TYPING_PAUSE_MS));
    merge(typed$, this.yearBand.valueChanges, this.now$)
      .pipe(
        map((): OutcomeSearch => ({
          frameworkId: this.frameworkId(),
          q: this.q.value.trim(),
          yearBand: this.yearBand.value,
        })),
        // Enter followed by the end of the typing pause asks for the same search once.
        distinctUntilChanged((a, b) => JSON.stringify(a) === JSON.stringify(b)),
        tap(() => this.searching.set(true)),
        switchMap((query) =>
          query.frameworkId
            ? this.api.search(query).pipe(catchError(() => of(null)))
            : of({ outcomes: [], truncated: false }),
        ),
        takeUntilDestroyed(inject(DestroyRef)),
      )
      .subscribe((answer) => {
        this.searching.set(false);
        this.searchFailed.set(answer === null);
        this.outcomes.set(answer?.outcomes ?? []);
        this.truncated.set(answer?.truncated ?? false);
      });
    this.loadFrameworks();
  }

  protected choose(id: string): void {
    this.frameworkId.set(id);
    // Another framework has other year bands.
    this.yearBand.setValue('', { emitEvent: false });
    this.now$.next();
  }

  /** Enter in the search field: search now, without the browser's own form submission. */
  protected searchNow(event: Event): void {
    event.preventDefault();
    this.now$.next();
  }

  protected clearSearch(): void {
    this.q.setValue('', { emitEvent: false });
    this.now$.next();
  }

  protected createFramework(): void {
    this.dialog
      .open(FrameworkDialog, { width: 'min(32rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((created?: Framework) => {
        if (!created) return;
        this.notifier.info(`${created.name} is created. Import its outcomes from a CSV file.`);
        this.frameworks.update((list) =>
          [...list, created].sort((a, b) => a.name.localeCompare(b.name)),
        );
        this.choose(created.id);
        this.importCsv(created);
      });
  }

  protected importCsv(framework: Framework): void {
    const data: OutcomeImportData = { frameworkId: framework.id, frameworkName: framework.name };
    this.dialog
      .open(OutcomeImportDialog, { data, width: 'min(44rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((result?: OutcomeImportResult) => {
        if (!result) return;
        this.notifier.info(importSummary(result));
        this.loadFrameworks(framework.id);
      });
  }

  // Typed cell readers: the table's row context is untyped under strict templates.
  protected codeOf(o: Outcome): string {
    return o.code;
  }
  protected descriptionOf(o: Outcome): string {
    return o.description;
  }
  protected strandOf(o: Outcome): string {
    return o.strand || '—';
  }
  protected yearBandOf(o: Outcome): string {
    return o.yearBand || '—';
  }

  /** Loads the frameworks and shows `keep` (after an import) or else the first one. */
  private loadFrameworks(keep?: string): void {
    this.api.frameworks().subscribe({
      next: (list) => {
        this.frameworks.set(list);
        this.frameworksLoaded.set(true);
        const id = list.find((f) => f.id === (keep ?? this.frameworkId()))?.id ?? list[0]?.id ?? '';
        this.frameworkId.set(id);
        // The search is asked again even when its words are the same: the outcomes changed.
        this.outcomes.set([]);
        this.forceSearch();
      },
      error: () => this.frameworksLoaded.set(true),
    });
  }

  private forceSearch(): void {
    // distinctUntilChanged would swallow the same query: run this one directly.
    const query: OutcomeSearch = {
      frameworkId: this.frameworkId(),
      q: this.q.value.trim(),
      yearBand: this.yearBand.value,
    };
    if (!query.frameworkId) return;
    this.searching.set(true);
    this.api.search(query).subscribe({
      next: (answer) => {
        this.searching.set(false);
        this.searchFailed.set(false);
        this.outcomes.set(answer.outcomes);
        this.truncated.set(answer.truncated);
      },
      error: () => {
        this.searching.set(false);
        this.searchFailed.set(true);
      },
    });
  }
}

/** "Imported 42 outcomes: 40 new, 2 changed, none removed." */
export function importSummary(r: OutcomeImportResult): string {
  const n = (k: number) => (k === 0 ? 'none' : String(k));
  return (
    `Imported ${r.imported} ${r.imported === 1 ? 'outcome' : 'outcomes'}: ` +
    `${n(r.added)} new, ${n(r.updated)} changed, ${n(r.removed)} removed.`
  );
}
