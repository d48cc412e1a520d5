import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  linkedSignal,
  signal,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { debounceTime } from 'rxjs';
import {
  OUTCOME_PAGE_MAX,
  type Framework,
  type Outcome,
  type OutcomeImportResult,
} from '../../../shared/schemas/outcomes';
import { Session } from '../auth/session';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
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
  private readonly frameworksRead = apiResource({ load: () => this.api.frameworks() });
  protected readonly frameworks = computed<readonly Framework[]>(
    () => this.frameworksRead.value() ?? [],
  );
  /** True once the first read answered, either way (a reload keeps the list shown). */
  protected readonly frameworksLoaded = computed(
    () => this.frameworksRead.value() !== undefined || this.frameworksRead.error() !== null,
  );
  /** The framework shown: the one picked while it is still listed, else the first. */
  protected readonly frameworkId = linkedSignal<readonly Framework[], string>({
    source: this.frameworks,
    computation: (list, previous) =>
      list.find((f) => f.id === previous?.value)?.id ?? list[0]?.id ?? '',
  });
  protected readonly framework = computed(
    () => this.frameworks().find((f) => f.id === this.frameworkId()) ?? null,
  );
  /** Admins and leads may create frameworks and import (the server's `outcomes.edit`). */
  protected readonly canEdit = computed(() =>
    ['admin', 'lead'].includes(this.session.user()?.role ?? ''),
  );

  protected readonly q = new FormControl('', { nonNullable: true });
  protected readonly yearBand = new FormControl('', { nonNullable: true });
  /** The search words as searched: set when typing pauses, on Enter and when cleared. */
  private readonly words = signal('');
  private readonly band = toSignal(this.yearBand.valueChanges, { initialValue: '' });
  /** The search; an equal one (Enter, then the end of the typing pause) is not asked twice. */
  private readonly query = computed<OutcomeSearch | undefined>(
    () => {
      const frameworkId = this.frameworkId();
      return frameworkId ? { frameworkId, q: this.words(), yearBand: this.band() } : undefined;
    },
    {
      equal: (a, b) =>
        a?.frameworkId === b?.frameworkId && a?.q === b?.q && a?.yearBand === b?.yearBand,
    },
  );
  /** The outcomes found; a newer search replaces an older one's answer still on its way. */
  private readonly search = apiResource({
    params: () => this.query(),
    load: (query: OutcomeSearch) => this.api.search(query),
  });
  protected readonly outcomes = computed(() => this.search.value()?.outcomes ?? []);
  protected readonly truncated = computed(() => this.search.value()?.truncated ?? false);
  protected readonly searching = this.search.loading;
  protected readonly searchFailed = computed(() => this.search.error() !== null);

  constructor() {
    this.q.valueChanges
      .pipe(debounceTime(TYPING_PAUSE_MS), takeUntilDestroyed())
      // The field's words now: a pause that ends after "Clear" must not bring the old ones back.
      .subscribe(() => this.words.set(this.q.value.trim()));
  }

  protected choose(id: string): void {
    this.frameworkId.set(id);
    // Another framework has other year bands (one search: both change before it is asked).
    this.yearBand.setValue('');
  }

  /** Enter in the search field: search now, without the browser's own form submission. */
  protected searchNow(event: Event): void {
    event.preventDefault();
    this.words.set(this.q.value.trim());
  }

  protected clearSearch(): void {
    this.q.setValue('', { emitEvent: false });
    this.words.set('');
  }

  protected createFramework(): void {
    this.dialog
      .open(FrameworkDialog, { width: 'min(32rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((created?: Framework) => {
        if (!created) return;
        this.notifier.info(`${created.name} is created. Import its outcomes from a CSV file.`);
        this.frameworksRead.set(
          [...this.frameworks(), created].sort((a, b) => a.name.localeCompare(b.name)),
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
        // Counts and year bands changed, and the outcomes: read both again (the same search too).
        this.frameworksRead.reload();
        this.search.reload();
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
}

/** "Imported 42 outcomes: 40 new, 2 changed, none removed." */
export function importSummary(r: OutcomeImportResult): string {
  const n = (k: number) => (k === 0 ? 'none' : String(k));
  return (
    `Imported ${r.imported} ${r.imported === 1 ? 'outcome' : 'outcomes'}: ` +
    `${n(r.added)} new, ${n(r.updated)} changed, ${n(r.removed)} removed.`
  );
}
