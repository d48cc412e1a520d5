import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { NETWORK_MESSAGE } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
import { SavedCopies } from '../offline/saved-copies';
import { demoUser, testProviders } from '../testing/test-providers';
import { Session } from './session';

describe('Session', () => {
  let session: Session;
  let backend: HttpTestingController;
  let notifier: jasmine.SpyObj<Notifier>;

  beforeEach(() => {
    notifier = jasmine.createSpyObj<Notifier>('Notifier', ['info', 'error']);
    TestBed.configureTestingModule({
      providers: [testProviders(), { provide: Notifier, useValue: notifier }],
    });
    session = TestBed.inject(Session);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  /** Lets the promise chain of start() reach its next request. */
  const tick = () => new Promise((resolve) => setTimeout(resolve));

  it('fetches the CSRF cookie first, then the user, once', async () => {
    const first = session.start();
    const second = session.start();
    expect(second).toBe(first);
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    await tick();
    const user = demoUser('lead');
    backend.expectOne('/api/auth/session').flush({ user });
    await first;
    expect(session.user()).toEqual(user);
    expect(session.signedIn()).toBeTrue();
  });

  it('asks /api/auth/session, whose 200 with no user means signed out, quietly (no 401)', async () => {
    const started = session.start();
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    await tick();
    backend.expectNone('/api/auth/me');
    backend.expectOne('/api/auth/session').flush({ user: null });
    await started;
    expect(session.user()).toBeNull();
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('still starts when the server cannot be reached, and says so', async () => {
    const started = session.start();
    backend.expectOne('/api/auth/csrf').error(new ProgressEvent('error'));
    await tick();
    backend.expectOne('/api/auth/session').error(new ProgressEvent('error'));
    await started;
    expect(session.user()).toBeNull();
    expect(notifier.error).toHaveBeenCalledOnceWith(NETWORK_MESSAGE);
  });

  it('rejects a user of the wrong shape instead of trusting it', async () => {
    const started = session.start();
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    await tick();
    backend.expectOne('/api/auth/session').flush({ user: { id: 'x', role: 'headmaster' } });
    await started;
    expect(session.user()).toBeNull();
    expect(notifier.error).toHaveBeenCalled();
  });

  it('signs out, forgets the user and takes a fresh CSRF cookie', async () => {
    session.update(demoUser('teacher'));
    let answer: { freshPage: boolean } | null = null;
    session.signOut().subscribe((a) => (answer = a));
    const request = backend.expectOne('/api/auth/sign-out');
    expect(request.request.method).toBe('POST');
    request.flush('', { status: 204, statusText: 'No Content' });
    expect(session.user()).toBeNull();
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    // Forgetting the saved copies (caches, storage) finishes a few tasks later.
    for (let i = 0; i < 100 && answer === null; i++) await tick();
    // Karma's page has no service worker, so there is none to replace by a fresh page.
    expect(answer as { freshPage: boolean } | null).toEqual({ freshPage: false });
  });

  it("forgets the person's saved copies at sign-out, and only those", async () => {
    localStorage.setItem('trayplan.saved.relief.today', '{"savedAt":"x","value":1}');
    localStorage.setItem('trayplan.saved.share.abc', '{"savedAt":"x","value":2}');
    localStorage.setItem('trayplan.other-setting', 'kept');
    const cache = await caches.open('trayplan-spec-cache');
    await cache.put('/api/lessons/spec-lesson', new Response('{"title":"Mine"}'));
    const copies = TestBed.inject(SavedCopies);
    copies.note('/api/lessons/spec-lesson', '2026-08-04T07:30:00.000Z');
    const shown = copies.savedAt(() => ['/api/lessons/spec-lesson']);
    expect(shown()).toBe('2026-08-04T07:30:00.000Z');
    session.update(demoUser('relief'));
    let done = false;
    session.signOut().subscribe(() => (done = true));
    backend.expectOne('/api/auth/sign-out').flush('', { status: 204, statusText: 'No Content' });
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    for (let i = 0; i < 100 && !done; i++) await tick();
    expect(done).toBeTrue();
    expect(localStorage.getItem('trayplan.saved.relief.today')).toBeNull();
    expect(localStorage.getItem('trayplan.saved.share.abc')).toBeNull();
    expect(localStorage.getItem('trayplan.other-setting')).toBe('kept');
    expect(await caches.keys()).not.toContain('trayplan-spec-cache');
    expect(shown()).toBeNull();
    localStorage.removeItem('trayplan.other-setting');
  });
  /** Signs in as `user` through the form's request and waits for the session to begin. */
  async function signInAs(user: ReturnType<typeof demoUser>): Promise<void> {
    let done = false;
    session.signIn({ email: user.email, password: 'x' }).subscribe(() => (done = true));
    backend.expectOne('/api/auth/sign-in').flush({ user });
    for (let i = 0; i < 100 && !done; i++) {
      await tick();
      for (const csrf of backend.match('/api/auth/csrf'))
        csrf.flush('', { status: 204, statusText: 'No Content' });
    }
    expect(done).toBeTrue();
  }

  it('forgets saved copies of someone else when the next person signs in without a sign-out', async () => {
    const relief = demoUser('relief');
    const teacher = demoUser('teacher');
    expect(teacher.id).not.toBe(relief.id);
    localStorage.setItem('trayplan.saved.owner', relief.id);
    localStorage.setItem('trayplan.saved.relief.today', '{"savedAt":"x","value":1}');
    const cache = await caches.open('trayplan-spec-claim');
    await cache.put('/api/lessons/spec-lesson', new Response('{"title":"Theirs"}'));
    await signInAs(teacher);
    expect(localStorage.getItem('trayplan.saved.relief.today')).toBeNull();
    expect(await caches.keys()).not.toContain('trayplan-spec-claim');
    expect(localStorage.getItem('trayplan.saved.owner')).toBe(teacher.id);
    expect(session.user()).toEqual(teacher);
    localStorage.removeItem('trayplan.saved.owner');
  });

  it('keeps the saved copies of the same person signing in again', async () => {
    const teacher = demoUser('teacher');
    localStorage.setItem('trayplan.saved.owner', teacher.id);
    localStorage.setItem('trayplan.saved.relief.today', '{"savedAt":"x","value":1}');
    await signInAs(teacher);
    expect(localStorage.getItem('trayplan.saved.relief.today')).not.toBeNull();
    localStorage.removeItem('trayplan.saved.relief.today');
    localStorage.removeItem('trayplan.saved.owner');
  });
});
