import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { yearLevelLabel, type SchoolClass } from '../../../shared/schemas/classes';
import { Session } from '../auth/session';
import { AppError } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { ClassForm } from './class-form';
import { ClassesApi } from './classes-api';
import { ClassDeleteDialog } from './delete-dialog';

/** `/classes`: the school's classes with their year level, students and devices. */
@Component({
  selector: 'app-classes',
  imports: [MatTableModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './classes.html',
  styleUrl: './classes.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Classes {
  private readonly api = inject(ClassesApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly session = inject(Session);

  /** The classes as read, then as changed here (added, saved, deleted). */
  private readonly read = apiResource({ load: () => this.api.list() });
  protected readonly loading = this.read.loading;
  protected readonly classes = computed<SchoolClass[]>(() => this.read.value() ?? []);
  /** A refusal to show above the table (e.g. a class that lessons use). */
  protected readonly problem = signal<string | null>(null);
  protected readonly canEdit = computed(() =>
    ['admin', 'teacher'].includes(this.session.user()?.role ?? ''),
  );
  protected readonly columns = computed(() => [
    'name',
    'yearLevel',
    'studentCount',
    'devices',
    'teachers',
    ...(this.canEdit() ? ['actions'] : []),
  ]);
  protected readonly yearLevelLabel = yearLevelLabel;

  protected teachersText(c: SchoolClass): string {
    return c.teachers.map((t) => t.name || t.email).join(', ') || '—';
  }

  protected add(): void {
    this.openForm(null);
  }

  protected edit(c: SchoolClass): void {
    this.openForm(c);
  }

  protected remove(c: SchoolClass): void {
    this.problem.set(null);
    this.dialog
      .open(ClassDeleteDialog, { data: { name: c.name }, role: 'alertdialog' })
      .afterClosed()
      .subscribe((confirmed?: boolean) => {
        if (!confirmed) return;
        this.api.remove(c.id).subscribe({
          next: () => {
            this.read.set(this.classes().filter((x) => x.id !== c.id));
            this.notifier.info(`${c.name} is deleted.`);
          },
          error: (error: unknown) => {
            this.problem.set(error instanceof AppError ? error.message : String(error));
          },
        });
      });
  }

  private openForm(c: SchoolClass | null): void {
    this.problem.set(null);
    this.dialog
      .open(ClassForm, { data: c, width: 'min(32rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((saved?: SchoolClass) => {
        if (!saved) return;
        const list = this.classes();
        this.read.set(c ? list.map((x) => (x.id === saved.id ? saved : x)) : [...list, saved]);
        this.notifier.info(`${saved.name} is saved.`);
      });
  }
}
