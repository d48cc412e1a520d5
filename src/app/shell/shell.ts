import { BreakpointObserver } from '@angular/cdk/layout';
import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  computed,
  inject,
  viewChild,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSidenav, MatSidenavModule } from '@angular/material/sidenav';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { distinctUntilChanged, map, of, switchMap } from 'rxjs';
import { Session } from '../auth/session';
import { DevMailApi } from '../dev-mail/dev-mail-api';
import { navItemsFor } from './navigation';

/** Below this width the navigation is a drawer behind a menu button. */
export const NARROW_QUERY = '(max-width: 839.98px)';

/** The signed-in frame: header with toolbar and user menu, navigation by role, main content. */
@Component({
  selector: 'app-shell',
  imports: [
    MatToolbarModule,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
    MatSidenavModule,
    MatListModule,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly devMail = inject(DevMailApi);
  private readonly drawer = viewChild.required<MatSidenav>('drawer');
  private readonly main = viewChild.required<ElementRef<HTMLElement>>('main');

  protected readonly user = this.session.user;

  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe(NARROW_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );

  /** Asked once per admin session: the outbox only exists in development. */
  private readonly devMailAvailable = toSignal(
    toObservable(computed(() => this.user()?.role)).pipe(
      distinctUntilChanged(),
      switchMap((role) => (role === 'admin' ? this.devMail.available() : of(false))),
    ),
    { initialValue: false },
  );

  protected readonly items = computed(() => {
    const user = this.user();
    return user ? navItemsFor(user.role, { devMailAvailable: this.devMailAvailable() }) : [];
  });

  /**
   * A plain `href="#main"` would resolve against `<base href="/">` and navigate home, so the skip
   * link moves focus itself.
   */
  protected skipToMain(event: Event): void {
    event.preventDefault();
    this.main().nativeElement.focus();
  }

  protected closeIfNarrow(): void {
    if (this.narrow()) void this.drawer().close();
  }

  protected signOut(): void {
    this.session.signOut().subscribe(({ freshPage }) => {
      // Without the removed worker, a full load gives the next person a new, empty one.
      if (freshPage) window.location.assign('/sign-in');
      else void this.router.navigate(['/sign-in']);
    });
  }
}
