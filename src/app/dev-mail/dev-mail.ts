import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  OnInit,
  computed,
  inject,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { DevMail as DevMailMessage } from '../../../shared/schemas/members';
import { Notifier } from '../errors/notifier';
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
export class DevMail implements OnInit {
  private readonly api = inject(DevMailApi);
  private readonly notifier = inject(Notifier);

  protected readonly loading = signal(true);
  protected readonly messages = signal<readonly DevMailMessage[]>([]);
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

  ngOnInit(): void {
    this.refresh();
  }

  protected refresh(): void {
    this.loading.set(true);
    this.api.list().subscribe({
      next: (messages) => {
        this.messages.set(messages);
        this.loading.set(false);
      },
      error: (error: unknown) => {
        this.loading.set(false);
        this.notifier.errorNotShownYet(error);
      },
    });
  }

  protected select(message: DevMailMessage): void {
    this.selectedId.set(message.id);
  }
}
