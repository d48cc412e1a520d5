import { ScrollRegion } from '../a11y/scroll-region';
import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule, type MatSelectChange } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { ROLES, ROLE_LABELS, type Role } from '../../../shared/schemas/common';
import type { Member } from '../../../shared/schemas/members';
import { Session } from '../auth/session';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { DeactivateDialog, type DeactivateDialogData } from './deactivate-dialog';
import { InviteDialog } from './invite-dialog';
import { STATUS_LABELS } from './labels';
import { MembersApi, type MemberChange } from './members-api';

/** `/members` (admins): the school's members, their roles and invitations. */
@Component({
  selector: 'app-members',
  imports: [
    ScrollRegion,
    DatePipe,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  templateUrl: './members.html',
  styleUrl: './members.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Members {
  private readonly api = inject(MembersApi);
  private readonly dialog = inject(MatDialog);
  private readonly notifier = inject(Notifier);
  private readonly session = inject(Session);
  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly columns = ['name', 'email', 'role', 'status', 'lastSignInAt', 'actions'];
  protected readonly selfId = computed(() => this.session.user()?.id ?? null);
  /** The members as read, then as changed here (invited, role or status changed). */
  private readonly read = apiResource({ load: () => this.api.list() });
  protected readonly loading = this.read.loading;
  /** Ids of members with a change on its way, whose controls wait for the answer. */
  protected readonly busy = signal<ReadonlySet<string>>(new Set());
  protected readonly members = computed<readonly Member[]>(() => this.read.value() ?? []);
  protected readonly filter = signal('');
  protected readonly dataSource = new MatTableDataSource<Member>([]);

  constructor() {
    this.dataSource.sortingDataAccessor = (member, column) => sortKey(member, column);
    this.dataSource.filterPredicate = (member, filter) => matches(member, filter);
    effect(() => {
      this.dataSource.sort = this.sort();
      this.dataSource.paginator = this.paginator();
    });
    effect(() => (this.dataSource.data = [...this.members()]));
    effect(() => (this.dataSource.filter = this.filter().trim().toLowerCase()));
  }

  protected invite(): void {
    this.dialog
      .open(InviteDialog, { width: 'min(32rem, calc(100vw - 2rem))', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((member?: Member) => {
        if (!member) return;
        this.read.set([...this.members(), member]);
        this.notifier.info(`Invitation sent to ${member.email}.`);
      });
  }

  protected changeRole(member: Member, event: MatSelectChange<Role>): void {
    const role = event.value;
    if (role === member.role) return;
    this.change(
      member,
      { role },
      (updated) => `${display(updated)} is now ${ROLE_LABELS[updated.role]}.`,
      () => {
        // The server refused (e.g. the last admin): put the select back to what is true.
        event.source.value = member.role;
      },
    );
  }

  protected deactivate(member: Member): void {
    const data: DeactivateDialogData = { name: member.name, email: member.email };
    this.dialog
      .open(DeactivateDialog, { data, role: 'alertdialog', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((confirmed?: boolean) => {
        if (!confirmed) return;
        this.change(
          member,
          { status: 'deactivated' },
          (updated) => `${display(updated)} is deactivated and can no longer sign in.`,
        );
      });
  }

  protected reactivate(member: Member): void {
    this.change(
      member,
      { status: 'active' },
      (updated) => `${display(updated)} can sign in again.`,
    );
  }

  protected resend(member: Member): void {
    this.track(member.id, true);
    this.api.resendInvitation(member.id).subscribe({
      next: (updated) => {
        this.replace(updated);
        this.notifier.info(`Invitation sent again to ${updated.email}.`);
      },
      error: (error: unknown) => {
        this.track(member.id, false);
        this.notifier.errorNotShownYet(error);
      },
    });
  }

  protected isBusy(member: Member): boolean {
    return this.busy().has(member.id);
  }

  protected label(member: Member): string {
    return display(member);
  }

  protected statusLabel(member: Member): string {
    return STATUS_LABELS[member.status];
  }

  /** Sends a change; errors are shown by the interceptor's snack-bar. */
  private change(
    member: Member,
    change: MemberChange,
    message: (updated: Member) => string,
    onError: () => void = () => undefined,
  ): void {
    this.track(member.id, true);
    this.api.update(member.id, change).subscribe({
      next: (updated) => {
        this.replace(updated);
        this.notifier.info(message(updated));
      },
      error: (error: unknown) => {
        this.track(member.id, false);
        this.notifier.errorNotShownYet(error);
        onError();
      },
    });
  }

  private replace(updated: Member): void {
    this.track(updated.id, false);
    this.read.set(this.members().map((m) => (m.id === updated.id ? updated : m)));
  }

  private track(id: string, busy: boolean): void {
    this.busy.update((ids) => {
      const next = new Set(ids);
      if (busy) next.add(id);
      else next.delete(id);
      return next;
    });
  }
}

/** A member's name, or their e-mail while an invitation is open and no name is set. */
function display(member: Member): string {
  return member.name.trim() || member.email;
}

function sortKey(member: Member, column: string): string | number {
  switch (column) {
    case 'name':
      return display(member).toLocaleLowerCase();
    case 'email':
      return member.email;
    case 'role':
      return ROLE_LABELS[member.role];
    case 'status':
      return STATUS_LABELS[member.status];
    case 'lastSignInAt':
      return member.lastSignInAt ? Date.parse(member.lastSignInAt) : 0;
    default:
      return '';
  }
}

/** Whether the filter text occurs in the name, e-mail, role or status as shown. */
function matches(member: Member, filter: string): boolean {
  const text = [member.name, member.email, ROLE_LABELS[member.role], STATUS_LABELS[member.status]]
    .join(' ')
    .toLowerCase();
  return text.includes(filter);
}
