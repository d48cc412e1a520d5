import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { errorBody, testProviders } from '../testing/test-providers';
import { RESET_SENT_MESSAGE, SIGN_IN_NOTICES } from './messages';
import { RESET_LINK_INVALID_MESSAGE, ResetComplete } from './reset-complete';
import { ResetRequest } from './reset-request';
import { SignIn } from './sign-in';

describe('password reset', () => {
  let harness: RouterTestingHarness;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: testProviders([
        { path: 'sign-in', component: SignIn },
        { path: 'reset', component: ResetRequest },
        { path: 'reset/:token', component: ResetComplete },
      ]),
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    loader = TestbedHarnessEnvironment.loader(harness.fixture);
  });

  afterEach(() => backend.verify());

  const text = () => (harness.routeNativeElement as HTMLElement).textContent ?? '';

  async function input(label: string): Promise<MatInputHarness> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  it('always answers a request with the same words', async () => {
    await harness.navigateByUrl('/reset', ResetRequest);
    await (await input('E-mail')).setValue('nobody@kestrel-ridge.example');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Send the link' }))).click();
    const request = backend.expectOne('/api/auth/password-reset');
    expect(request.request.body).toEqual({ email: 'nobody@kestrel-ridge.example' });
    request.flush({ ok: true }, { status: 202, statusText: 'Accepted' });
    await harness.fixture.whenStable();
    expect(text()).toContain(RESET_SENT_MESSAGE);
    expect(text()).toContain(
      "If that address has an account, we've sent a link to reset the password.",
    );
  });

  it('sets the new password and goes to sign-in with a message', async () => {
    await harness.navigateByUrl('/reset/reset-token-0123456789', ResetComplete);
    await (await input('New password')).setValue('count the parts back in');
    await (await input('New password again')).setValue('count the parts back in');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save the password' }))).click();
    const request = backend.expectOne('/api/auth/password-reset/complete');
    expect(request.request.body).toEqual({
      token: 'reset-token-0123456789',
      password: 'count the parts back in',
    });
    request.flush('', { status: 204, statusText: 'No Content' });
    await harness.fixture.whenStable();
    expect(TestBed.inject(Router).url).toBe('/sign-in?notice=password-reset');
    expect(text()).toContain(SIGN_IN_NOTICES['password-reset']);
  });

  it('says when the link was used or has run out', async () => {
    await harness.navigateByUrl('/reset/reset-token-0123456789', ResetComplete);
    await (await input('New password')).setValue('count the parts back in');
    await (await input('New password again')).setValue('count the parts back in');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save the password' }))).click();
    backend
      .expectOne('/api/auth/password-reset/complete')
      .flush(errorBody('token-invalid', 'Invalid token.'), {
        status: 400,
        statusText: 'Bad Request',
      });
    await harness.fixture.whenStable();
    expect(text()).toContain(RESET_LINK_INVALID_MESSAGE);
  });

  it('shows a refused common password under the field', async () => {
    await harness.navigateByUrl('/reset/reset-token-0123456789', ResetComplete);
    await (await input('New password')).setValue('password1');
    await (await input('New password again')).setValue('password1');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save the password' }))).click();
    backend
      .expectOne('/api/auth/password-reset/complete')
      .flush(errorBody('password-common', 'That password is too common. Choose another.'), {
        status: 400,
        statusText: 'Bad Request',
      });
    await harness.fixture.whenStable();
    const field = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'New password' }),
    );
    expect(await field.getTextErrors()).toEqual(['That password is too common. Choose another.']);
  });
});
