import { ChangeDetectionStrategy, Component } from '@angular/core';
import type { MatDialog } from '@angular/material/dialog';
import { of, type Observable } from 'rxjs';
import { confirm } from '../forms/confirm-dialog';

/**
 * An endorsement is of the unit as it was: the server returns an endorsed unit to draft on any
 * edit of it, its lessons or their activities (API.md, "Review and coverage"). The editors say so
 * while the unit is endorsed and ask before the first change is saved.
 */
@Component({
  selector: 'app-endorsed-notice',
  template: `
    <p class="notice" role="note">
      <strong>This unit is endorsed.</strong> Saving any change to it, its lessons or their
      activities returns it to draft, and it will need to be sent for review again.
    </p>
  `,
  styles: `
    .notice {
      border-inline-start: 4px solid var(--mat-sys-tertiary);
      background: var(--mat-sys-surface-container);
      padding: 0.5rem 0.75rem;
      margin: 0 0 1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EndorsedNotice {}

/**
 * Asks before a change to an endorsed unit is saved; emits true at once when `endorsedTitle` is
 * null (the unit is not endorsed). `change` names what is saved, e.g. "this lesson".
 */
export function confirmEndorsedEdit(
  dialog: MatDialog,
  endorsedTitle: string | null,
  change = 'this change',
): Observable<boolean> {
  if (endorsedTitle === null) return of(true);
  return confirm(dialog, {
    title: 'Return the unit to draft?',
    message: `“${endorsedTitle}” is endorsed. Saving ${change} returns it to draft: it leaves the endorsed units, and its authors will need to send it for review again.`,
    confirm: 'Save and return to draft',
    cancel: 'Don’t save',
  });
}

/** The sentence a delete question adds while the unit is endorsed ('' when it is not). */
export function endorsedDeleteNote(endorsedTitle: string | null): string {
  return endorsedTitle === null
    ? ''
    : ` “${endorsedTitle}” is endorsed: this returns it to draft, and it will need to be sent for review again.`;
}
