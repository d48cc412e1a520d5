import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Member } from '../../../shared/schemas/members';
import { Session } from '../auth/session';
import { demoUser, errorBody, testProviders } from '../testing/test-providers';
import { EMAIL_TAKEN_MESSAGE } from './invite-dialog';
import { Members } from './members';

/** Invented members of the invented demo school. */
const MEMBERS: Member[] = [
  {
    id: 'user-admin',
    name: 'Robin Ashdown',
    email: 'admin@kestrel-ridge.example',
    role: 'admin',
    status: 'active',
    lastSignInAt: '2026-07-20T08:15:00+09:30',
    invitationExpiresAt: null,
  },
  {
    id: 'm-teacher',
    name: 'Jordan Pell',
    email: 'teacher@kestrel-ridge.example',
    role: 'teacher',
    status: 'active',
    lastSignInAt: '2026-07-27T14:02:00+09:30',
    invitationExpiresAt: null,
  },
  {
    id: 'm-invited',
    name: '',
    email: 'new.relief@kestrel-ridge.example',
    role: 'relief',
    status: 'invited',
    lastSignInAt: null,
    // 12:00 UTC: the 3rd of August in every time zone from UTC-11 to UTC+11.
    invitationExpiresAt: '2026-08-03T21:30:00+09:30',
  },
];

describe('Members', () => {
  let fixture: ComponentFixture<Members>;
  let loader: HarnessLoader;
  let root: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: testProviders() });
    TestBed.inject(Session).update(demoUser('admin'));
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Members);
    loader = TestbedHarnessEnvironment.loader(fixture);
    root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    fixture.detectChanges();
    backend.expectOne('/api/members').flush({ members: MEMBERS });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function rowOf(name: string) {
    const table = await loader.getHarness(MatTableHarness);
    for (const row of await table.getRows()) {
      const text = await row.getCellTextByColumnName();
      if (text['name'] === name || text['email'] === name) return row;
    }
    throw new Error(`no row for ${name}`);
  }

  async function roleSelectOf(name: string): Promise<MatSelectHarness> {
    const [cell] = await (await rowOf(name)).getCells({ columnName: 'role' });
    return cell.getHarness(MatSelectHarness);
  }

  async function snackBarMessage(): Promise<string> {
    return (await root.getHarness(MatSnackBarHarness)).getMessage();
  }

  it('renders one row per member with name, e-mail, role, status and last sign-in', async () => {
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getCellTextByColumnName();
    expect(rows['name'].text).toEqual(['Jordan Pell', 'Not set yet', 'Robin Ashdown']);
    expect(rows['email'].text).toContain('new.relief@kestrel-ridge.example');
    expect(rows['role'].text).toEqual(['Teacher', 'Relief teacher', 'School admin']);
    expect(rows['status'].text).toEqual(['Active', 'Invited until 3 Aug', 'Active']);
    expect(rows['lastSignInAt'].text[1]).toBe('Never');
  });

  it('sorts by last sign-in', async () => {
    const sort = await loader.getHarness(MatSortHarness);
    const [header] = await sort.getSortHeaders({ label: 'Last sign-in' });
    await header.click();
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getCellTextByColumnName())['email'].text).toEqual([
      'new.relief@kestrel-ridge.example',
      'admin@kestrel-ridge.example',
      'teacher@kestrel-ridge.example',
    ]);
  });

  it('filters by what the table shows, including role words', async () => {
    const filter = await loader.getHarness(MatInputHarness.with({ selector: '[type=search]' }));
    await filter.setValue('relief teacher');
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getCellTextByColumnName())['email'].text).toEqual([
      'new.relief@kestrel-ridge.example',
    ]);
  });

  it('sends a PATCH with the new role and shows the result', async () => {
    const select = await roleSelectOf('Jordan Pell');
    await select.open();
    await select.clickOptions({ text: 'Curriculum lead' });
    const request = backend.expectOne('/api/members/m-teacher');
    expect(request.request.method).toBe('PATCH');
    expect(request.request.body).toEqual({ role: 'lead' });
    request.flush({ member: { ...MEMBERS[1], role: 'lead' } });
    expect(await snackBarMessage()).toBe('Jordan Pell is now Curriculum lead.');
    expect(await (await roleSelectOf('Jordan Pell')).getValueText()).toBe('Curriculum lead');
  });

  it('puts the role back when the server refuses, and shows why', async () => {
    const select = await roleSelectOf('Robin Ashdown');
    await select.open();
    await select.clickOptions({ text: 'Teacher' });
    backend
      .expectOne('/api/members/user-admin')
      .flush(errorBody('last-admin', 'A school needs at least one admin.'), {
        status: 400,
        statusText: 'Bad Request',
      });
    expect(await snackBarMessage()).toBe('A school needs at least one admin.');
    expect(await (await roleSelectOf('Robin Ashdown')).getValueText()).toBe('School admin');
  });

  it('asks before deactivating, then sends the change', async () => {
    const row = await rowOf('Jordan Pell');
    const [actions] = await row.getCells({ columnName: 'actions' });
    await (await actions.getHarness(MatButtonHarness.with({ text: 'Deactivate' }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Deactivate Jordan Pell?');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Deactivate' }))).click();
    const request = backend.expectOne('/api/members/m-teacher');
    expect(request.request.body).toEqual({ status: 'deactivated' });
    request.flush({ member: { ...MEMBERS[1], status: 'deactivated' } });
    expect(await snackBarMessage()).toBe('Jordan Pell is deactivated and can no longer sign in.');
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getCellTextByColumnName())['status'].text[0]).toBe('Deactivated');
  });

  it('sends nothing when the deactivation is cancelled', async () => {
    const [actions] = await (await rowOf('Jordan Pell')).getCells({ columnName: 'actions' });
    await (await actions.getHarness(MatButtonHarness.with({ text: 'Deactivate' }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
    backend.expectNone('/api/members/m-teacher');
    expect(await root.getAllHarnesses(MatDialogHarness)).toEqual([]);
  });

  it('offers no way to deactivate yourself', async () => {
    const [actions] = await (await rowOf('Robin Ashdown')).getCells({ columnName: 'actions' });
    expect(await actions.getAllHarnesses(MatButtonHarness)).toEqual([]);
  });

  it('resends an open invitation', async () => {
    const [actions] = await (
      await rowOf('new.relief@kestrel-ridge.example')
    ).getCells({
      columnName: 'actions',
    });
    await (await actions.getHarness(MatButtonHarness.with({ text: 'Resend invitation' }))).click();
    const request = backend.expectOne('/api/members/m-invited/resend');
    expect(request.request.method).toBe('POST');
    request.flush({ member: MEMBERS[2] }, { status: 202, statusText: 'Accepted' });
    expect(await snackBarMessage()).toBe(
      'Invitation sent again to new.relief@kestrel-ridge.example.',
    );
  });

  it('invites a member from the dialog and adds the row', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Invite/ }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    await (
      await dialog.getHarness(MatInputHarness)
    ).setValue('Second.Teacher@Kestrel-Ridge.example');
    const role = await dialog.getHarness(MatSelectHarness);
    await role.open();
    await role.clickOptions({ text: 'Curriculum lead' });
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    const request = backend.expectOne('/api/members/invitations');
    expect(request.request.body).toEqual({
      email: 'second.teacher@kestrel-ridge.example',
      role: 'lead',
    });
    const invited: Member = {
      id: 'm-new',
      name: '',
      email: 'second.teacher@kestrel-ridge.example',
      role: 'lead',
      status: 'invited',
      lastSignInAt: null,
      invitationExpiresAt: '2026-08-04T09:00:00+09:30',
    };
    request.flush({ member: invited }, { status: 201, statusText: 'Created' });
    expect(await snackBarMessage()).toBe(
      'Invitation sent to second.teacher@kestrel-ridge.example.',
    );
    const table = await loader.getHarness(MatTableHarness);
    expect((await table.getRows()).length).toBe(4);
  });

  it('shows a taken address under the e-mail field of the invite dialog', async () => {
    await (await loader.getHarness(MatButtonHarness.with({ text: /Invite/ }))).click();
    const dialog = await root.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatInputHarness)).setValue('teacher@kestrel-ridge.example');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Send invitation' }))).click();
    backend
      .expectOne('/api/members/invitations')
      .flush(errorBody('already-member', 'Taken.'), { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(await dialog.getText()).toContain(EMAIL_TAKEN_MESSAGE);
    expect(await root.getAllHarnesses(MatSnackBarHarness)).toEqual([]);
  });
});
