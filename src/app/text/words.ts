/**
 * Template pipes over the shared word and clock helpers, so screens and printables say counts
 * and times the same way: `{{ n | plural: 'piece' }}` → `1 piece`, `{{ t | clock }}` → `11:10 am`.
 */
import { Pipe, type PipeTransform } from '@angular/core';
import { plural } from '../../../shared/text/plural';
import { clockTime } from '../../../shared/text/clock';

@Pipe({ name: 'plural' })
export class PluralPipe implements PipeTransform {
  transform(n: number, one: string, many?: string): string {
    return plural(n, one, many);
  }
}

@Pipe({ name: 'clock' })
export class ClockPipe implements PipeTransform {
  transform(value: string): string {
    return clockTime(value);
  }
}
