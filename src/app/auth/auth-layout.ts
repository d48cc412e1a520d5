import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatToolbarModule } from '@angular/material/toolbar';
import { RouterOutlet } from '@angular/router';

/** The frame of the signed-out pages: a header with the product name and a centred main. */
@Component({
  selector: 'app-auth-layout',
  imports: [MatToolbarModule, RouterOutlet],
  template: `
    <header>
      <mat-toolbar class="toolbar"><span class="brand">Trayplan</span></mat-toolbar>
    </header>
    <main id="main" tabindex="-1">
      <router-outlet />
    </main>
  `,
  styles: `
    @use '@angular/material' as mat;

    .toolbar {
      @include mat.toolbar-overrides(
        (
          container-background-color: var(--mat-sys-primary),
          container-text-color: var(--mat-sys-on-primary),
        )
      );
    }
    .brand {
      font-weight: 700;
    }
    main {
      display: flex;
      justify-content: center;
      padding: 2rem 1rem 3rem;
      outline: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuthLayout {}
