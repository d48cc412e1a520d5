import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { BasedOn } from '../../../shared/schemas/units';

/**
 * "Based on version N of <unit> by <owner>, copied <date>", linking to the original while the
 * reader can still open it (it may since have been made private or deleted).
 */
@Component({
  selector: 'app-unit-provenance',
  imports: [DatePipe, MatIconModule, RouterLink],
  template: `
    @let b = basedOn();
    <p class="provenance">
      <mat-icon aria-hidden="true">content_copy</mat-icon>
      <span>
        Based on version {{ b.version }} of
        @if (b.readable) {
          <a [routerLink]="['/units', b.unitId]">{{ b.title }}</a>
        } @else {
          <span>{{ b.title }}</span>
        }
        by {{ b.ownerName }}, copied {{ b.copiedAt | date: 'd MMM y' }}
        @if (!b.readable) {
          <span class="muted">(the original is no longer shared with you)</span>
        }
      </span>
    </p>
  `,
  styles: `
    .provenance {
      display: flex;
      align-items: center;
      gap: 0.5rem;
      margin: 0 0 0.75rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitProvenance {
  readonly basedOn = input.required<BasedOn>();
}
