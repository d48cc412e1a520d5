import { TestBed } from '@angular/core/testing';
import { Title } from '@angular/platform-browser';
import { Router, TitleStrategy } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import type { Role } from '../../shared/schemas/common';
import { routes } from './app.routes';
import { Session } from './auth/session';
import { demoUser, testProviders } from './testing/test-providers';
import { TrayplanTitleStrategy } from './title-strategy';

describe('app routes', () => {
  let harness: RouterTestingHarness;

  async function start(role: Role | null): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        testProviders(routes),
        { provide: TitleStrategy, useClass: TrayplanTitleStrategy },
      ],
    });
    const session = TestBed.inject(Session);
    // The session is loaded as at start-up, without the two requests.
    spyOn(session, 'start').and.resolveTo();
    if (role) session.update(demoUser(role));
    harness = await RouterTestingHarness.create();
  }

  // No HttpTestingController.verify(): the feature pages behind these routes load their own data,
  // which is theirs to test; this spec is about where each URL leads.

  const url = () => TestBed.inject(Router).url;
  const page = () => (harness.fixture.nativeElement as HTMLElement).textContent ?? '';

  it('sends a signed-out visitor of any page to sign-in, keeping the page', async () => {
    await start(null);
    await harness.navigateByUrl('/');
    expect(url()).toBe('/sign-in');
    expect(page()).toContain('Forgot your password?');
    await harness.navigateByUrl('/members');
    expect(url()).toBe('/sign-in?returnUrl=%2Fmembers');
  });

  it('opens the signed-out pages without a session', async () => {
    await start(null);
    await harness.navigateByUrl('/reset');
    expect(page()).toContain('Reset your password');
    expect(TestBed.inject(Title).getTitle()).toBe('Reset your password · Trayplan');
  });

  it('shows the shell with the home page to a signed-in user', async () => {
    await start('teacher');
    await harness.navigateByUrl('/');
    expect(url()).toBe('/');
    const root = harness.fixture.nativeElement as HTMLElement;
    expect(root.querySelector('header')?.textContent).toContain('Trayplan');
    expect(root.querySelector('header')?.textContent).toContain('Robin Ashdown');
    // The one navigation landmark (mat-nav-list has the role), named Main.
    const navigation = root.querySelector('[role="navigation"][aria-label="Main"]');
    expect(navigation?.textContent).toContain('Units');
    expect(root.querySelector('main')).not.toBeNull();
    expect(TestBed.inject(Title).getTitle()).toBe('Home · Trayplan');
  });

  it('sends a role away from an area that is not theirs, and unknown paths home', async () => {
    await start('teacher');
    await harness.navigateByUrl('/members');
    expect(url()).toBe('/');
    await harness.navigateByUrl('/no-such-page');
    expect(url()).toBe('/');
  });

  it('sends a signed-in user away from sign-in', async () => {
    await start('relief');
    await harness.navigateByUrl('/sign-in');
    // Home for a relief teacher is their day (issue 13): they land on Today.
    expect(url()).toBe('/today');
  });
});
