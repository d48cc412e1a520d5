import { FormControl, FormGroup } from '@angular/forms';
import { newPasswordSchema } from '../../../shared/schemas/auth';
import { emailSchema } from '../../../shared/schemas/common';
import { FieldErrorPipe } from './field-error';
import { matchesSibling, zodValidator } from './validators';

describe('form validators', () => {
  const text = new FieldErrorPipe();

  it('uses the shared schema and its message', () => {
    const control = new FormControl('not an address', {
      validators: [zodValidator(emailSchema, 'Enter your e-mail address.')],
    });
    expect(text.transform(control.errors)).toBe(
      'Enter a valid e-mail address, like name@school.example.',
    );
    control.setValue('teacher@kestrel-ridge.example');
    expect(control.errors).toBeNull();
  });

  it('says what is missing while the field is empty', () => {
    const control = new FormControl('', {
      validators: [zodValidator(emailSchema, 'Enter your e-mail address.')],
    });
    expect(text.transform(control.errors)).toBe('Enter your e-mail address.');
  });

  it('applies the password length rule of the shared schema (NIST SP 800-63B: at least 8)', () => {
    const control = new FormControl('seven77', { validators: [zodValidator(newPasswordSchema)] });
    expect(text.transform(control.errors)).toBe('Use at least 8 characters.');
    control.setValue('eight888');
    expect(control.errors).toBeNull();
  });

  it('requires a confirmation to match its sibling', () => {
    const form = new FormGroup({
      password: new FormControl('tray and tub'),
      confirm: new FormControl('', { validators: [matchesSibling('password', 'No match.')] }),
    });
    form.controls.confirm.setValue('tray and tube');
    expect(text.transform(form.controls.confirm.errors)).toBe('No match.');
    form.controls.confirm.setValue('tray and tub');
    expect(form.controls.confirm.errors).toBeNull();
  });
});
