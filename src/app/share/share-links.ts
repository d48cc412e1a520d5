import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Notifier } from '../errors/notifier';
import { apiResource } from '../http/resource';
import type { ShareLink } from '../../../shared/schemas/sharing';
import { savedLabel } from '../offline/saved-copy';
import { ShareLinksApi } from './share-links-api';

/**
 * The lesson page's share links: a link for a relief teacher without an account (copied, or
 * e-mailed), and every link of the lesson with whom it went to, until when, and a way to
 * withdraw it. The address is shown once, when made: Trayplan keeps only a hash of it.
 */
@Component({
  selector: 'app-share-links',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
  ],
  template: `
    <h2 id="share-h">Share with a relief teacher</h2>
    <p class="muted">
      A link opens this lesson and its lesson pack without an account, until the end of the lesson's
      day (at most 14 days). Anyone with the link can see the lesson.
    </p>
    <form class="make" (submit)="$event.preventDefault(); make()">
      <mat-form-field>
        <mat-label>E-mail it to (optional)</mat-label>
        <input matInput type="email" [formControl]="email" autocomplete="email" />
        @if (email.hasError('email')) {
          <mat-error>Enter a valid e-mail address, like name&#64;school.example.</mat-error>
        }
      </mat-form-field>
      <button matButton="filled" type="submit" [disabled]="busy()">
        <mat-icon aria-hidden="true">link</mat-icon>
        Make a link
      </button>
    </form>
    @if (made(); as url) {
      <p class="made" role="status">
        New link (shown only now):
        <a [href]="url">{{ url }}</a>
        <button matButton type="button" (click)="copy(url)">Copy</button>
      </p>
    }
    @if (links().length) {
      <ul class="links" aria-labelledby="share-h">
        @for (link of links(); track link.id) {
          <li>
            <span>
              {{ link.email ?? 'Copied link' }} · until {{ label(link.expiresAt) }}
              @if (link.revokedAt) {
                · <strong>withdrawn {{ label(link.revokedAt) }}</strong>
              } @else if (expired(link)) {
                · <strong>run out</strong>
              }
            </span>
            @if (!link.revokedAt && !expired(link)) {
              <button matButton type="button" (click)="revoke(link)" [disabled]="busy()">
                Withdraw
              </button>
            }
          </li>
        }
      </ul>
    }
  `,
  styles: `
    .make {
      display: flex;
      gap: 12px;
      align-items: baseline;
      flex-wrap: wrap;
    }
    .made a {
      word-break: break-all;
    }
    .links li {
      display: flex;
      gap: 12px;
      align-items: center;
      justify-content: space-between;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShareLinks {
  private readonly api = inject(ShareLinksApi);
  private readonly notifier = inject(Notifier);

  readonly lessonId = input.required<string>();

  /** The lesson's links, read again after one is made or withdrawn. */
  private readonly read = apiResource({
    params: () => this.lessonId(),
    load: (lessonId: string) => this.api.list(lessonId),
  });
  protected readonly links = computed<readonly ShareLink[]>(() => this.read.value()?.links ?? []);
  protected readonly made = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly email = new FormControl('', {
    nonNullable: true,
    validators: [Validators.email],
  });

  protected make(): void {
    if (this.email.invalid || this.busy()) return;
    const email = this.email.value.trim();
    this.busy.set(true);
    this.api.create(this.lessonId(), email ? { email } : {}).subscribe({
      next: (link) => {
        this.busy.set(false);
        this.made.set(link.url);
        this.email.reset();
        this.notifier.info(email ? `Link e-mailed to ${email}.` : 'Link made.');
        this.read.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.notifier.errorNotShownYet(e);
      },
    });
  }

  protected revoke(link: ShareLink): void {
    this.busy.set(true);
    this.api.revoke(link.id).subscribe({
      next: () => {
        this.busy.set(false);
        this.notifier.info('Link withdrawn: it no longer opens the lesson.');
        this.read.reload();
      },
      error: (e: unknown) => {
        this.busy.set(false);
        this.notifier.errorNotShownYet(e);
      },
    });
  }

  protected copy(url: string): void {
    void navigator.clipboard?.writeText(url).then(() => this.notifier.info('Link copied.'));
  }

  protected label(iso: string): string {
    return savedLabel(iso);
  }

  protected expired(link: ShareLink): boolean {
    return Date.parse(link.expiresAt) <= Date.now();
  }
}
