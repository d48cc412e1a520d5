import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTabsModule } from '@angular/material/tabs';
import { RouterLink } from '@angular/router';
import {
  UNIT_STATUSES,
  UNIT_STATUS_LABELS,
  type UnitStatus,
  type UnitSummary,
} from '../../../shared/schemas/units';
import { TERMS, YEAR_LEVELS, yearLabel } from './labels';
import { UnitsApi, type TeacherRef, type UnitFilters } from './units-api';
import { CopyDialog, copyDialogData } from './copy-dialog';
import { Session } from '../auth/session';
import { apiResource } from '../http/resource';
import { MatDialog } from '@angular/material/dialog';

/** `/units`: "My units" and the school library, filtered by year level, term, status and text. */
@Component({
  selector: 'app-unit-list',
  imports: [
    DatePipe,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
    MatTabsModule,
  ],
  templateUrl: './unit-list.html',
  styleUrl: './unit-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitList {
  private readonly api = inject(UnitsApi);
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);

  protected readonly scopes = ['mine', 'library'] as const;
  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly terms = TERMS;
  protected readonly statuses = UNIT_STATUSES;
  protected readonly statusLabels = UNIT_STATUS_LABELS;

  /** The status in words; takes the typed row (a table cell's `let` row is untyped). */
  protected statusLabel(unit: UnitSummary): string {
    return UNIT_STATUS_LABELS[unit.status];
  }
  protected readonly columns = [
    'title',
    'area',
    'yearLevel',
    'term',
    'status',
    'owner',
    'lessons',
    'updated',
  ];

  /** The library has a Copy button on each row. */
  protected readonly shownColumns = computed(() =>
    this.scope() === 'library' ? [...this.columns, 'copy'] : this.columns,
  );

  protected readonly scope = signal<UnitFilters['scope']>('mine');
  protected readonly yearLevel = signal<number | null>(null);
  protected readonly term = signal<number | null>(null);
  protected readonly status = signal<UnitStatus | null>(null);
  protected readonly owner = signal<string | null>(null);
  protected readonly q = signal('');

  private readonly filters = computed<UnitFilters>(() => ({
    scope: this.scope(),
    yearLevel: this.yearLevel(),
    term: this.term(),
    status: this.status(),
    owner: this.owner(),
    q: this.q(),
  }));

  /** The owner filter's choices; without them the filter offers only "Anyone". */
  private readonly teachersRead = apiResource({ load: () => this.api.teachers() });
  protected readonly teachers = computed<readonly TeacherRef[]>(
    () => this.teachersRead.value() ?? [],
  );
  /** The units of the filters; typing drops the answers of the earlier letters. */
  private readonly read = apiResource({
    params: () => this.filters(),
    load: (filters: UnitFilters) => this.api.list(filters),
  });
  protected readonly loading = this.read.loading;
  /** The list shown: the last one read, kept while the next loads (or if it fails to). */
  protected readonly units = linkedSignal<UnitSummary[] | undefined, readonly UnitSummary[]>({
    source: this.read.value,
    computation: (units, previous) => units ?? previous?.value ?? [],
  });

  /** Whether the signed-in teacher co-authors (and does not own) the unit. */
  protected coauthored(unit: UnitSummary): boolean {
    const me = this.session.user()?.id;
    return unit.canEdit && me !== undefined && unit.owner.id !== me;
  }

  /** Reads the unit (for its first lesson's date), then opens the copy dialog. */
  protected copy(summary: UnitSummary): void {
    this.api
      .get(summary.id)
      .subscribe((unit) =>
        this.dialog.open(CopyDialog, { data: copyDialogData(unit), width: '34rem' }),
      );
  }

  protected selectTab(index: number): void {
    this.scope.set(this.scopes[index] ?? 'mine');
  }

  protected year(level: number): string {
    return yearLabel(level);
  }
}
