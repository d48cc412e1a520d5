import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { testProviders } from '../testing/test-providers';
import { markInvalidFields } from './invalid-fields';

@Component({
  selector: 'app-invalid-fields-host',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  template: `
    <form [formGroup]="form" (ngSubmit)="(0)">
      <mat-form-field>
        <mat-label>Title</mat-label>
        <input matInput formControlName="title" required />
        <mat-error>Required</mat-error>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Notes</mat-label>
        <textarea matInput formControlName="notes"></textarea>
        <mat-error>Too long</mat-error>
      </mat-form-field>
      <button type="submit">Save</button>
    </form>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class Host {
  readonly form = new FormGroup({
    // Required through the validator alone: matInput reads it from the control.
    title: new FormControl('', Validators.required),
    notes: new FormControl('', Validators.maxLength(5)),
  });
  constructor() {
    markInvalidFields();
  }
}

/**
 * WCAG 2.2 SC 3.3.1 Error Identification and SC 4.1.2 Name, Role, Value: a field drawn in its
 * error state is exposed as invalid to assistive technology (WAI-ARIA 1.2, aria-invalid).
 */
describe('markInvalidFields', () => {
  async function render() {
    TestBed.configureTestingModule({ providers: testProviders() });
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    return {
      fixture,
      title: root.querySelector('input')!,
      notes: root.querySelector('textarea')!,
      submit: root.querySelector<HTMLButtonElement>('button[type=submit]')!,
    };
  }

  it('leaves an untouched empty required field unmarked as invalid', async () => {
    const { title } = await render();
    expect(title.getAttribute('aria-invalid')).not.toBe('true');
  });

  it('marks an empty required field invalid once it is touched', async () => {
    const { fixture, title } = await render();
    title.dispatchEvent(new Event('focus'));
    title.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
    expect(fixture.componentInstance.form.controls.title.touched).toBeTrue();
    expect(title.getAttribute('aria-invalid')).toBe('true');
  });

  it('marks an empty required field invalid when its form is submitted untouched', async () => {
    const { fixture, title, submit } = await render();
    submit.click();
    await fixture.whenStable();
    expect(title.getAttribute('aria-invalid')).toBe('true');
  });

  it('says "false" again once the field is filled in', async () => {
    const { fixture, title, submit } = await render();
    submit.click();
    await fixture.whenStable();
    title.value = 'Bridges';
    title.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(title.getAttribute('aria-invalid')).toBe('false');
  });

  it('marks a touched field that breaks another rule, not only required ones', async () => {
    const { fixture, notes } = await render();
    notes.value = 'far too long';
    notes.dispatchEvent(new Event('input'));
    notes.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
    expect(notes.getAttribute('aria-invalid')).toBe('true');
  });
});
