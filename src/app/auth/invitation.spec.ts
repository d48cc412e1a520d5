import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { Blank, demoUser, errorBody, testProviders } from '../testing/test-providers';
import { INVITATION_INVALID_MESSAGE, Invitation } from './invitation';
import { Session } from './session';

describe('Invitation', () => {
  let harness: RouterTestingHarness;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: testProviders([
        { path: 'invitation/:token', component: Invitation },
        { path: '', component: Blank },
      ]),
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    await harness.navigateByUrl('/invitation/inv-token-0123456789', Invitation);
    loader = TestbedHarnessEnvironment.loader(harness.fixture);
  });

  afterEach(() => backend.verify());

  const text = () => (harness.routeNativeElement as HTMLElement).textContent ?? '';

  async function input(label: string): Promise<MatInputHarness> {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  it('says clearly when the invitation has run out or was used', async () => {
    backend
      .expectOne('/api/invitations/inv-token-0123456789')
      .flush(errorBody('invitation-invalid', 'Invalid.'), { status: 404, statusText: 'Not Found' });
    await harness.fixture.whenStable();
    expect(text()).toContain(INVITATION_INVALID_MESSAGE);
    expect(await loader.getAllHarnesses(MatInputHarness)).toEqual([]);
  });

  it('shows school, e-mail and role, then accepts and signs in', async () => {
    backend.expectOne('/api/invitations/inv-token-0123456789').flush({
      email: 'new.relief@kestrel-ridge.example',
      role: 'relief',
      schoolName: 'Kestrel Ridge Primary School',
      expiresAt: '2026-08-03T21:30:00+09:30',
    });
    await harness.fixture.whenStable();
    expect(text()).toContain('Kestrel Ridge Primary School');
    expect(text()).toContain('new.relief@kestrel-ridge.example');
    expect(text()).toContain('Relief teacher');

    await (await input('Your name')).setValue('Casey Moreno');
    await (await input('Password')).setValue('pack away the tubs');
    await (await input('Password again')).setValue('pack away the tubs');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Join and sign in' }))).click();

    const request = backend.expectOne('/api/invitations/inv-token-0123456789/accept');
    expect(request.request.body).toEqual({ name: 'Casey Moreno', password: 'pack away the tubs' });
    const user = demoUser('relief', { name: 'Casey Moreno' });
    request.flush({ user });
    backend.expectOne('/api/auth/csrf').flush('', { status: 204, statusText: 'No Content' });
    await harness.fixture.whenStable();
    expect(TestBed.inject(Session).user()).toEqual(user);
    expect(TestBed.inject(Router).url).toBe('/');
  });

  it('does not send passwords that differ', async () => {
    backend.expectOne('/api/invitations/inv-token-0123456789').flush({
      email: 'new.relief@kestrel-ridge.example',
      role: 'relief',
      schoolName: 'Kestrel Ridge Primary School',
      expiresAt: '2026-08-03T21:30:00+09:30',
    });
    await harness.fixture.whenStable();
    await (await input('Your name')).setValue('Casey Moreno');
    await (await input('Password')).setValue('pack away the tubs');
    await (await input('Password again')).setValue('pack away the tub');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Join and sign in' }))).click();
    const confirm = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Password again' }),
    );
    expect(await confirm.getTextErrors()).toEqual(["The two passwords don't match."]);
    backend.expectNone('/api/invitations/inv-token-0123456789/accept');
  });
});
