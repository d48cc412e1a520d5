import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { NETWORK_MESSAGE } from '../errors/app-error';
import { Notifier } from '../errors/notifier';
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

  it('signs out, forgets the user and takes a fresh CSRF cookie', () => {
    session.update(demoUser('teacher'));
    let done = false;
    session.signOut().subscribe(() => (done = true));
    const request = backend.expectOne('/api/auth/sign-out');
    expect(request.request.method).toBe('POST');
    request.flush('', { status: 204, statusText: 'No Content' });
    expect(session.user()).toBeNull();
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    expect(done).toBeTrue();
  });
});
