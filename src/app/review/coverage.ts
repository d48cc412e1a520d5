import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  Injector,
  afterNextRender,
  computed,
  inject,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import type { Coverage, CoverageOutcome, CoverageUnit } from '../../../shared/schemas/review';
import type { Framework } from '../../../shared/schemas/outcomes';
import { UNIT_STATUS_LABELS } from '../../../shared/schemas/units';
import { Session } from '../auth/session';
import { saveBlob } from '../files/transfer';
import { apiResource } from '../http/resource';
import { YEAR_LEVELS, yearLabel } from '../units/labels';
import { ReviewApi, type CoverageFilters } from './review-api';

/** A clicked cell: its outcome, column and units. */
interface Picked {
  outcome: CoverageOutcome;
  yearLevel: number;
  term: number;
  units: CoverageUnit[];
}

/** A table row: a strand's heading, or an outcome. */
type Row = { kind: 'strand'; strand: string } | { kind: 'outcome'; outcome: CoverageOutcome };

/**
 * `/coverage`: which outcomes of a framework the school's units cover in each year level and
 * term. Gaps are written "Gap" (not shown by colour alone, WCAG 2.2 SC 1.4.1); a cell lists its
 * units when clicked; the matrix downloads as CSV or as a landscape PDF.
 */
@Component({
  selector: 'app-coverage',
  imports: [
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatProgressBarModule,
    MatSelectModule,
  ],
  templateUrl: './coverage.html',
  styleUrl: './coverage.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CoveragePage {
  private readonly api = inject(ReviewApi);
  private readonly user = inject(Session).user;
  private readonly injector = inject(Injector);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  protected readonly yearLevels = YEAR_LEVELS;
  protected readonly statusLabels = UNIT_STATUS_LABELS;
  private readonly frameworksRead = apiResource({ load: () => this.api.frameworks() });
  protected readonly frameworks = computed<Framework[]>(() => this.frameworksRead.value() ?? []);
  /** The framework shown: the first one read, until another is chosen. */
  protected readonly frameworkId = linkedSignal<string | null>(
    () => this.frameworks()[0]?.id ?? null,
  );
  protected readonly yearLevel = signal<number | null>(null);
  protected readonly scope = signal<'any' | 'endorsed'>('any');
  protected readonly downloading = signal<'csv' | 'pdf' | null>(null);

  private readonly filters = computed<CoverageFilters | null>(() => {
    const frameworkId = this.frameworkId();
    return frameworkId ? { frameworkId, yearLevel: this.yearLevel(), status: this.scope() } : null;
  });
  /** The matrix of the choices; a quick change of choices never lets an older matrix win. */
  private readonly matrixRead = apiResource({
    params: () => this.filters() ?? undefined,
    load: (filters: CoverageFilters) => this.api.coverage(filters),
  });
  /** The matrix shown: the last one read, kept while the next loads (or if it fails to). */
  protected readonly matrix = linkedSignal<Coverage | undefined, Coverage | null>({
    source: this.matrixRead.value,
    computation: (matrix, previous) => matrix ?? previous?.value ?? null,
  });
  protected readonly loading = computed(
    () => this.frameworksRead.loading() || this.matrixRead.loading(),
  );
  /** The cell whose units are listed; other choices drop it. */
  protected readonly picked = linkedSignal<CoverageFilters | null, Picked | null>({
    source: this.filters,
    computation: () => null,
  });

  /** The year levels of the columns, each spanning its terms. */
  protected readonly years = computed(() => {
    const m = this.matrix();
    if (!m) return [];
    const out: { yearLevel: number; terms: number }[] = [];
    for (const c of m.columns) {
      const last = out[out.length - 1];
      if (last?.yearLevel === c.yearLevel) last.terms++;
      else out.push({ yearLevel: c.yearLevel, terms: 1 });
    }
    return out;
  });

  protected readonly rows = computed<Row[]>(() => {
    const rows: Row[] = [];
    let strand: string | null = null;
    for (const outcome of this.matrix()?.outcomes ?? []) {
      if (outcome.strand !== strand && outcome.strand !== '')
        rows.push({ kind: 'strand', strand: outcome.strand });
      strand = outcome.strand;
      rows.push({ kind: 'outcome', outcome });
    }
    return rows;
  });

  protected readonly gaps = computed(
    () =>
      this.matrix()?.outcomes.filter((o) => o.cells.every((c) => c.units.length === 0)).length ?? 0,
  );

  protected year(level: number): string {
    return yearLabel(level);
  }

  protected pick(outcome: CoverageOutcome, i: number): void {
    const cell = outcome.cells[i]!;
    this.picked.set({ outcome, yearLevel: cell.yearLevel, term: cell.term, units: cell.units });
    // The list is above the matrix, out of sight from a cell far down: bring it into view and
    // move focus to it, so the click is seen to do something (and a screen reader reads it).
    afterNextRender(
      () => {
        const heading = this.host.nativeElement.querySelector<HTMLElement>('#picked-heading');
        heading?.scrollIntoView({ block: 'nearest' });
        heading?.focus({ preventScroll: true });
      },
      { injector: this.injector },
    );
  }

  protected isPicked(outcome: CoverageOutcome, i: number): boolean {
    const p = this.picked();
    const cell = outcome.cells[i]!;
    return p?.outcome.id === outcome.id && p.yearLevel === cell.yearLevel && p.term === cell.term;
  }

  protected cellLabel(outcome: CoverageOutcome, i: number): string {
    const c = outcome.cells[i]!;
    const n = c.units.length;
    const what = n === 0 ? 'gap, no unit' : n === 1 ? '1 unit' : `${n} units`;
    return `${outcome.code}, ${yearLabel(c.yearLevel)} term ${c.term}: ${what}`;
  }

  /** Admins open a unit on its review page (they do not use the Units area). */
  protected unitLink(id: string): string[] {
    return this.user()?.role === 'admin' ? ['/review/units', id] : ['/units', id];
  }

  protected download(kind: 'csv' | 'pdf'): void {
    const f = this.filters();
    if (!f) return;
    this.downloading.set(kind);
    this.api.coverageFile(f, kind).subscribe({
      next: (event) => {
        if (event.kind !== 'done') return;
        this.downloading.set(null);
        saveBlob(event.blob, event.name ?? `coverage.${kind}`);
      },
      // The interceptor has shown the error; only the progress bar stops here.
      error: () => this.downloading.set(null),
    });
  }
}
