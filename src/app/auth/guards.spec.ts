import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import type { SessionUser } from '../../../shared/schemas/auth';
import { Blank, demoUser, testProviders } from '../testing/test-providers';
import { roleGuard, signedInGuard, signedOutGuard } from './guards';
import { Session } from './session';

describe('route guards', () => {
  const user = signal<SessionUser | null>(null);
  let start: jasmine.Spy<() => Promise<void>>;

  beforeEach(() => {
    user.set(null);
    start = jasmine.createSpy('start').and.resolveTo();
    TestBed.configureTestingModule({
      providers: [
        testProviders([
          { path: 'sign-in', canActivate: [signedOutGuard], component: Blank },
          {
            path: '',
            canActivate: [signedInGuard],
            children: [
              { path: '', component: Blank },
              { path: 'members', canActivate: [roleGuard(['admin'])], component: Blank },
              { path: 'units', canActivate: [roleGuard(['teacher', 'lead'])], component: Blank },
            ],
          },
        ]),
        {
          provide: Session,
          useValue: { start, user, signedIn: () => user() !== null },
        },
      ],
    });
  });

  let harness: RouterTestingHarness | undefined;

  afterEach(() => (harness = undefined));

  async function land(url: string): Promise<string> {
    harness ??= await RouterTestingHarness.create();
    await harness.navigateByUrl(url);
    return TestBed.inject(Router).url;
  }

  it('sends an anonymous visitor to sign-in, keeping the return URL', async () => {
    expect(await land('/units?term=3')).toBe('/sign-in?returnUrl=%2Funits%3Fterm%3D3');
    expect(start).toHaveBeenCalled();
  });

  it('sends an anonymous visitor of the home page to sign-in without a return URL', async () => {
    expect(await land('/')).toBe('/sign-in');
  });

  it('lets a role through to its own area', async () => {
    user.set(demoUser('teacher'));
    expect(await land('/units')).toBe('/units');
  });

  it('sends a wrong role home', async () => {
    user.set(demoUser('teacher'));
    expect(await land('/members')).toBe('/');
    user.set(demoUser('relief'));
    expect(await land('/units')).toBe('/');
  });

  it('sends a signed-in user away from sign-in', async () => {
    user.set(demoUser('admin'));
    expect(await land('/sign-in')).toBe('/');
  });
});
