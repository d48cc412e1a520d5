import { HttpTestingController } from '@angular/common/http/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { Blank, demoUser, errorBody, testProviders } from '../testing/test-providers';
import { INVALID_CREDENTIALS_MESSAGE } from './messages';
import { Session } from './session';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  let harness: RouterTestingHarness;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: testProviders([
        { path: 'sign-in', component: SignIn },
        { path: 'units', component: Blank },
        { path: '', component: Blank },
      ]),
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/sign-in?returnUrl=%2Funits', SignIn);
    loader = TestbedHarnessEnvironment.loader(harness.fixture);
  });

  afterEach(() => backend.verify());

  async function field(label: string): Promise<MatFormFieldHarness> {
    return loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
  }

  async function fillAndSubmit(email: string, password: string): Promise<void> {
    await (
      await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))
    ).setValue(email);
    await (
      await loader.getHarness(MatInputHarness.with({ selector: '[type=password]' }))
    ).setValue(password);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
  }

  /** The message above the form (our own markup, not Material's). */
  function alertText(): string | null {
    const alert = (harness.routeNativeElement as HTMLElement).querySelector('[role=alert]');
    return alert?.textContent?.trim() ?? null;
  }

  it('shows what is missing under each field and sends nothing', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
    expect(await (await field('E-mail')).getTextErrors()).toEqual(['Enter your e-mail address.']);
    expect(await (await field('Password')).getTextErrors()).toEqual(['Enter your password.']);
    backend.expectNone('/api/auth/sign-in');
  });

  it("refuses an address that is not an e-mail address, in the shared schema's words", async () => {
    await fillAndSubmit('teacher.kestrel-ridge', 'trayplan-demo');
    expect(await (await field('E-mail')).getTextErrors()).toEqual([
      'Enter a valid e-mail address, like name@school.example.',
    ]);
    backend.expectNone('/api/auth/sign-in');
  });

  it('shows a 401 inline as a mismatch of e-mail and password', async () => {
    await fillAndSubmit('teacher@kestrel-ridge.example', 'wrong password');
    const request = backend.expectOne('/api/auth/sign-in');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({
      email: 'teacher@kestrel-ridge.example',
      password: 'wrong password',
    });
    request.flush(errorBody('invalid-credentials', 'Invalid credentials.'), {
      status: 401,
      statusText: 'Unauthorized',
    });
    await harness.fixture.whenStable();
    expect(alertText()).toBe(INVALID_CREDENTIALS_MESSAGE);
    expect(alertText()).toBe("That e-mail and password don't match an account.");
    expect(TestBed.inject(Router).url).toBe('/sign-in?returnUrl=%2Funits');
  });

  it('shows a 429 with the wait from Retry-After in whole minutes', async () => {
    await fillAndSubmit('teacher@kestrel-ridge.example', 'another guess');
    backend.expectOne('/api/auth/sign-in').flush(errorBody('too-many-attempts', 'Slow down.'), {
      status: 429,
      statusText: 'Too Many Requests',
      headers: { 'Retry-After': '840' },
    });
    await harness.fixture.whenStable();
    expect(alertText()).toBe('Too many attempts. Try again in 14 minutes.');
  });

  for (const [seconds, expected] of [
    ['61', 'Too many attempts. Try again in 2 minutes.'],
    ['30', 'Too many attempts. Try again in 1 minute.'],
  ]) {
    it(`rounds a part minute up (Retry-After: ${seconds})`, async () => {
      await fillAndSubmit('teacher@kestrel-ridge.example', 'another guess');
      backend.expectOne('/api/auth/sign-in').flush(errorBody('too-many-attempts', 'Slow down.'), {
        status: 429,
        statusText: 'Too Many Requests',
        headers: { 'Retry-After': seconds },
      });
      await harness.fixture.whenStable();
      expect(alertText()).toBe(expected);
    });
  }

  it('signs in, takes a fresh CSRF cookie and goes to the return URL', async () => {
    await fillAndSubmit(' Teacher@Kestrel-Ridge.example ', 'trayplan-demo');
    const user = demoUser('teacher');
    const request = backend.expectOne('/api/auth/sign-in');
    expect(request.request.body.email).toBe('teacher@kestrel-ridge.example');
    request.flush({ user });
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    await harness.fixture.whenStable();
    expect(TestBed.inject(Session).user()).toEqual(user);
    expect(TestBed.inject(Router).url).toBe('/units');
  });

  it('puts validation details from the server under their fields', async () => {
    await fillAndSubmit('teacher@kestrel-ridge.example', 'x');
    backend
      .expectOne('/api/auth/sign-in')
      .flush(
        errorBody('validation', 'Check the fields.', [
          { path: 'email', message: 'That address is too long.' },
        ]),
        { status: 400, statusText: 'Bad Request' },
      );
    await harness.fixture.whenStable();
    expect(await (await field('E-mail')).getTextErrors()).toEqual(['That address is too long.']);
    expect(alertText()).toBeNull();
  });
});
