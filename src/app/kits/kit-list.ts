import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import type { KitType, KitTypeSummary } from '../../../shared/schemas/kits';
import { Session } from '../auth/session';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { KitTypeDialog } from './kit-type-dialog';
import { KitsApi } from './kits-api';

/** Roles that may change kits (the server's policy decides; this only hides controls). */
export const KIT_EDITORS = ['admin', 'teacher'];

/** `/kits`: the school's kit types. */
@Component({
  selector: 'app-kit-list',
  imports: [RouterLink, MatTableModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    <section class="page">
      <div class="heading">
        <h1>Kits</h1>
        <div class="actions">
          <a matButton="outlined" routerLink="/kits/bookings">
            <mat-icon aria-hidden="true">event</mat-icon>
            Bookings
          </a>
          @if (canEdit()) {
            <button matButton="filled" type="button" (click)="create()">
              <mat-icon aria-hidden="true">add</mat-icon>
              New kit type
            </button>
          }
        </div>
      </div>
      <p class="muted">Each kit type has a parts list; its tubs are the physical kits.</p>
      @if (loading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading kit types" />
      }
      <div class="table-wrap">
        <table mat-table [dataSource]="kitTypes()">
          <caption class="visually-hidden">
            Kit types of the school
          </caption>
          <ng-container matColumnDef="name">
            <th mat-header-cell *matHeaderCellDef>Kit type</th>
            <td mat-cell *matCellDef="let kit">
              <a [routerLink]="['/kits', kit.id]">{{ kit.name }}</a>
              @if (kit.description) {
                <div class="muted">{{ kit.description }}</div>
              }
            </td>
          </ng-container>
          <ng-container matColumnDef="partCount">
            <th mat-header-cell *matHeaderCellDef>Part lines</th>
            <td mat-cell *matCellDef="let kit">{{ kit.partCount }}</td>
          </ng-container>
          <ng-container matColumnDef="pieceCount">
            <th mat-header-cell *matHeaderCellDef>Pieces per tub</th>
            <td mat-cell *matCellDef="let kit">{{ kit.pieceCount }}</td>
          </ng-container>
          <ng-container matColumnDef="tubCount">
            <th mat-header-cell *matHeaderCellDef>Tubs</th>
            <td mat-cell *matCellDef="let kit">{{ kit.tubCount }}</td>
          </ng-container>
          <ng-container matColumnDef="lessonCount">
            <th mat-header-cell *matHeaderCellDef>Lessons</th>
            <td mat-cell *matCellDef="let kit">{{ kit.lessonCount }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let kit; columns: columns"></tr>
          <tr class="mat-mdc-row" *matNoDataRow>
            <td class="mat-mdc-cell empty" [attr.colspan]="columns.length">
              @if (!loading()) {
                No kit types yet.
              }
            </td>
          </tr>
        </table>
      </div>
    </section>
  `,
  styles: `
    .heading {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 0.5rem 1rem;
      h1 {
        margin: 0;
      }
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 0.5rem;
    }
    .table-wrap {
      overflow-x: auto;
    }
    table {
      width: 100%;
      min-width: 40rem;
    }
    .empty {
      padding: 1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class KitList {
  private readonly api = inject(KitsApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly router = inject(Router);
  private readonly session = inject(Session);

  protected readonly columns = ['name', 'partCount', 'pieceCount', 'tubCount', 'lessonCount'];
  private readonly read = apiResource({ load: () => this.api.list() });
  protected readonly loading = this.read.loading;
  protected readonly kitTypes = computed<KitTypeSummary[]>(() => this.read.value() ?? []);
  protected readonly canEdit = computed(() =>
    KIT_EDITORS.includes(this.session.user()?.role ?? ''),
  );

  protected create(): void {
    this.dialog
      .open(KitTypeDialog, { width: 'min(32rem, calc(100vw - 2rem))' })
      .afterClosed()
      .subscribe((kit?: KitType) => {
        if (!kit) return;
        this.notifier.info(`${kit.name} is created. Import its parts list next.`);
        void this.router.navigate(['/kits', kit.id]);
      });
  }
}
