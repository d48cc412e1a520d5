import { Pipe, type PipeTransform } from '@angular/core';
import type { PrepBorrow } from '../../../shared/prep/index';

/** The borrows of one group (pure, so the pull list gets the same array until the plan changes). */
@Pipe({ name: 'groupBorrows' })
export class GroupBorrowsPipe implements PipeTransform {
  transform(borrows: readonly PrepBorrow[], group: number): PrepBorrow[] {
    return borrows.filter((b) => b.group === group);
  }
}
