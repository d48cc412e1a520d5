import { ChangeDetectionStrategy, Component } from '@angular/core';
import { RouterOutlet } from '@angular/router';
import { markInvalidFields } from './a11y/invalid-fields';

/** The root: everything below is decided by the router. */
@Component({
  selector: 'app-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  constructor() {
    // Shared across every form and dialog (issue 15): fields in error say so to screen readers.
    markInvalidFields();
  }
}
