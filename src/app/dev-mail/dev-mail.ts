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
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { DevMail as DevMailMessage } from '../../../shared/schemas/members';
import { tap } from 'rxjs';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import { DevMailApi } from './dev-mail-api';
import { linkify } from './linkify';

/**
 * `/dev/mail` (admins, development only): what the fake SMTP server received, so invitation and
 * reset links can be followed without a real mailbox.
 */
@Component({
  selector: 'app-dev-mail',
  imports: [DatePipe, MatListModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './dev-mail.html',
  styleUrl: './dev-mail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DevMail {
  private readonly api = inject(DevMailApi);
  private readonly notifier = inject(Notifier);

  private readonly read = apiResource({
    load: () =>
      this.api
        .list()
        .pipe(tap({ error: (error: unknown) => this.notifier.errorNotShownYet(error) })),
  });
  protected readonly loading = this.read.loading;
  /** The messages shown: the last ones read, kept while Refresh reads again (or if it fails). */
  protected readonly messages = linkedSignal<
    readonly DevMailMessage[] | undefined,
    readonly DevMailMessage[]
  >({
    source: this.read.value,
    computation: (messages, previous) => messages ?? previous?.value ?? [],
  });
  protected readonly selectedId = signal<string | null>(null);
  protected readonly selected = computed(
    () => this.messages().find((m) => m.id === this.selectedId()) ?? this.messages().at(0) ?? null,
  );
  protected readonly parts = computed(() => linkify(this.selected()?.text ?? ''));
  /** Links the server found (e.g. in the HTML part) that the plain text does not show. */
  protected readonly otherLinks = computed(() => {
    const shown = new Set(this.parts().flatMap((p) => (p.kind === 'link' ? [p.href] : [])));
    return (this.selected()?.links ?? []).filter(
      (link) => !shown.has(link) && /^https?:\/\//.test(link),
    );
  });

  protected refresh(): void {
    this.read.reload();
  }

  protected select(message: DevMailMessage): void {
    this.selectedId.set(message.id);
  }
}
