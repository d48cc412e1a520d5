import { HttpClient } from '@angular/common/http';
import { HttpTestingController, type TestRequest } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { Session } from '../auth/session';
import { Blank, demoUser, errorBody, testProviders } from '../testing/test-providers';
import { AppError, NETWORK_MESSAGE } from './app-error';
import { callerShowsErrors } from './error-context';
import { SESSION_ENDED_MESSAGE } from './error-interceptor';
import { Notifier } from './notifier';

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let router: Router;
  let notifier: jasmine.SpyObj<Notifier>;

  beforeEach(() => {
    notifier = jasmine.createSpyObj<Notifier>('Notifier', ['info', 'error']);
    TestBed.configureTestingModule({
      providers: [
        testProviders([
          { path: 'sign-in', component: Blank },
          { path: 'members', component: Blank },
          { path: '', component: Blank },
        ]),
        { provide: Notifier, useValue: notifier },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
  });

  afterEach(() => backend.verify());

  /** Subscribes, answers the one request with `respond`, and returns the error it failed with. */
  async function failure(
    url: string,
    respond: (req: TestRequest) => void,
    options: { context?: ReturnType<typeof callerShowsErrors> } = {},
  ): Promise<AppError> {
    const result = firstValueFrom(http.get(url, options)).then(
      () => {
        throw new Error(`expected ${url} to fail`);
      },
      (error: unknown) => error as AppError,
    );
    respond(backend.expectOne(url));
    return result;
  }

  it('turns an API error body into one AppError shape and shows it in a snack-bar', async () => {
    const error = await failure('/api/members', (req) =>
      req.flush(
        errorBody('validation', 'Check the highlighted fields.', [
          { path: 'role', message: 'Choose a role.' },
        ]),
        { status: 400, statusText: 'Bad Request' },
      ),
    );
    expect(error).toEqual(jasmine.any(AppError));
    expect({ ...error, message: error.message }).toEqual(
      jasmine.objectContaining({
        status: 400,
        code: 'validation',
        message: 'Check the highlighted fields.',
        details: [{ path: 'role', message: 'Choose a role.' }],
      }),
    );
    expect(notifier.error).toHaveBeenCalledOnceWith('Check the highlighted fields.');
  });

  it('leaves showing the error to a caller that asked for it', async () => {
    const error = await failure(
      '/api/members/invitations',
      (req) =>
        req.flush(errorBody('email-taken', 'Taken.'), { status: 409, statusText: 'Conflict' }),
      { context: callerShowsErrors() },
    );
    expect(error.code).toBe('email-taken');
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('gives a network failure a friendly message', async () => {
    const error = await failure('/api/members', (req) => req.error(new ProgressEvent('error')));
    expect([error.status, error.code, error.message]).toEqual([0, 'network', NETWORK_MESSAGE]);
    expect(notifier.error).toHaveBeenCalledOnceWith(NETWORK_MESSAGE);
  });

  it('sends a 401 to sign-in, keeping the page as the return URL, and forgets the user', async () => {
    const session = TestBed.inject(Session);
    session.update(demoUser('admin'));
    await router.navigateByUrl('/members');
    const error = await failure('/api/members', (req) =>
      req.flush(errorBody('signed-out', 'Sign in.'), { status: 401, statusText: 'Unauthorized' }),
    );
    await new Promise((resolve) => setTimeout(resolve));
    expect(error.status).toBe(401);
    expect(router.url).toBe('/sign-in?returnUrl=%2Fmembers');
    expect(session.user()).toBeNull();
    expect(notifier.error).toHaveBeenCalledOnceWith(SESSION_ENDED_MESSAGE);
  });

  it('does not redirect for the 401 of /api/auth/me (that only means signed out)', async () => {
    await router.navigateByUrl('/members');
    const error = await failure('/api/auth/me', (req) =>
      req.flush(errorBody('signed-out', 'Sign in.'), { status: 401, statusText: 'Unauthorized' }),
    );
    await new Promise((resolve) => setTimeout(resolve));
    expect(error.status).toBe(401);
    expect(router.url).toBe('/members');
  });
});
