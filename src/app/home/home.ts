import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { ROLE_LABELS } from '../../../shared/schemas/common';
import { Session } from '../auth/session';

/** The first page after sign-in: for now a welcome with the user's name and role. */
@Component({
  selector: 'app-home',
  template: `
    @if (user(); as user) {
      <section class="page">
        <h1>Welcome, {{ user.name }}</h1>
        <p>
          You are signed in to {{ user.schoolName }} as <strong>{{ roleLabel() }}</strong>.
        </p>
        <p class="muted">Your lessons, prep tasks and reviews for the week will be listed here.</p>
      </section>
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Home {
  protected readonly user = inject(Session).user;
  protected readonly roleLabel = computed(() => {
    const user = this.user();
    return user ? ROLE_LABELS[user.role] : '';
  });
}
