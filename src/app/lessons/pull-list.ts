import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatTableModule } from '@angular/material/table';
import type { PrepBorrow, PrepLine } from '../../../shared/prep/index';
import type { Part } from '../../../shared/schemas/kits';
import { ScrollRegion } from '../a11y/scroll-region';

/** What a pull list shows of a part: its name, and its colour and compartment when known. */
export type PartInfo = Pick<Part, 'name'> & Partial<Pick<Part, 'colour' | 'compartment'>>;

/** One row of a pull list, as the table shows it. */
export interface PullRow {
  code: string;
  name: string;
  colour: string;
  compartment: string;
  quantity: string;
  short: boolean;
  from: string;
  /** `Borrowed: return 2 to Tub 3`, or '' when everything comes from the home tub. */
  borrow: string;
}

/**
 * A pull list (a group's, the class tray's or the spares tray's) as a Material table. Parts are
 * named as the prep answer names them; a code the parts list no longer has is shown as the code.
 */
@Component({
  selector: 'app-pull-list',
  imports: [MatTableModule, ScrollRegion],
  template: `
    <div class="table-wrap" [appScrollRegion]="caption() + ' (scrolls sideways)'">
      <table mat-table [dataSource]="rows()">
        <caption class="visually-hidden">
          {{
            caption()
          }}
        </caption>
        <ng-container matColumnDef="part">
          <th mat-header-cell *matHeaderCellDef>Part</th>
          <td mat-cell *matCellDef="let row" class="title">
            {{ row.name }} <span class="muted code">{{ row.code }}</span>
          </td>
        </ng-container>
        <ng-container matColumnDef="colour">
          <th mat-header-cell *matHeaderCellDef>Colour</th>
          <td mat-cell *matCellDef="let row" data-label="Colour">
            {{ row.colour }}
          </td>
        </ng-container>
        <ng-container matColumnDef="compartment">
          <th mat-header-cell *matHeaderCellDef>Compartment</th>
          <td mat-cell *matCellDef="let row" data-label="Compartment">
            {{ row.compartment }}
          </td>
        </ng-container>
        <ng-container matColumnDef="quantity">
          <th mat-header-cell *matHeaderCellDef>Quantity</th>
          <td mat-cell *matCellDef="let row" [class.short]="row.short" data-label="Quantity">
            {{ row.quantity }}
          </td>
        </ng-container>
        <ng-container matColumnDef="from">
          <th mat-header-cell *matHeaderCellDef>From</th>
          <td mat-cell *matCellDef="let row" data-label="From">
            <span>
              {{ row.from }}
              @if (row.borrow) {
                <span class="borrow">{{ row.borrow }}</span>
              }
            </span>
          </td>
        </ng-container>
        <tr mat-header-row *matHeaderRowDef="columns"></tr>
        <tr mat-row *matRowDef="let row; columns: columns"></tr>
        <tr class="mat-mdc-row" *matNoDataRow>
          <td class="mat-mdc-cell empty" [attr.colspan]="columns.length">Nothing to pull.</td>
        </tr>
      </table>
    </div>
  `,
  styleUrl: './pull-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PullList {
  readonly lines = input.required<readonly PrepLine[]>();
  readonly parts = input.required<ReadonlyMap<string, PartInfo>>();
  readonly caption = input.required<string>();
  readonly borrows = input<readonly PrepBorrow[]>([]);

  protected readonly columns = ['part', 'colour', 'compartment', 'quantity', 'from'];
  protected readonly rows = computed(() =>
    this.lines().map((line) => pullRow(line, this.parts(), this.borrows())),
  );
}

/** A plan line joined with its part and the borrows of the same part. */
export function pullRow(
  line: PrepLine,
  parts: ReadonlyMap<string, PartInfo>,
  borrows: readonly PrepBorrow[],
): PullRow {
  const part = parts.get(line.partCode);
  const short = line.allocated < line.needed;
  const from = line.sources.length
    ? line.sources.map((s) => `${s.tub} × ${s.qty}`).join(', ')
    : 'No tub has any left';
  const borrowed = borrows.filter((b) => b.partCode === line.partCode);
  return {
    code: line.partCode,
    name: part?.name ?? line.partCode,
    colour: part?.colour ?? '—',
    compartment: part?.compartment ?? '—',
    quantity: short ? `${line.allocated} of ${line.needed}` : String(line.allocated),
    short,
    from,
    borrow: borrowed.length
      ? `Borrowed: return ${borrowed.map((b) => `${b.qty} to ${b.fromTub}`).join(', ')}`
      : '',
  };
}
